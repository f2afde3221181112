import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  return deleteBlockedSpan(useDB(), actor.id, id)
})
