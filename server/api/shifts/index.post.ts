import { ShiftBodySchema } from '../../../shared/schemas/shift'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, ShiftBodySchema)
  const { id, timeNotes } = createShift(useDB(), actor, body)
  setResponseStatus(event, 201)
  return { ...findShiftView(useDB(), id)!, timeNotes }
})
