import { IdParamsSchema } from '../../utils/validation'

// One shift as the reviewer sees it: the queue item, whether it can be decided now, and its history.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'safety', 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  return buildReviewItem(useDB(), id)
})
