import { IdParamsSchema } from '../../../utils/validation'

// The planned outing and the latest departure of one shift, for the crew's buttons.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety', 'crew')
  const { id } = readParamsAs(event, IdParamsSchema)
  return findShiftFieldStatus(useDB(), actor, id, nowMs())
})
