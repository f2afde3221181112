import { IdParamsSchema } from '../../../utils/validation'

// Records that the party of a shift went out (a person on it, or coordinator/safety on their behalf).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety', 'crew')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, DepartureBodySchema)
  const party = recordDeparture(useDB(), actor, id, body, nowMs())
  setResponseStatus(event, 201)
  return party
})
