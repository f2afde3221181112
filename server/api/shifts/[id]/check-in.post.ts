import { IdParamsSchema } from '../../../utils/validation'

// Records a call from the field on the party's open outing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety', 'crew')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, CheckInBodySchema)
  const party = recordCheckIn(useDB(), actor, id, body, nowMs())
  setResponseStatus(event, 201)
  return party
})
