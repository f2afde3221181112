import { IdParamsSchema } from '../../utils/validation'
import { ShiftPatchSchema } from '../../../shared/schemas/shift'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const patch = await readBodyAs(event, ShiftPatchSchema)
  const { timeNotes } = updateShift(useDB(), actor, id, patch)
  return { ...findShiftView(useDB(), id)!, timeNotes }
})
