import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  return requireSite(id)
})
