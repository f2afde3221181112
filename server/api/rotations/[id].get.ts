import { IdParamsSchema } from '../../utils/validation'

// A rotation with every shift it made (coordinator, safety).
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator', 'safety')
  const { id } = readParamsAs(event, IdParamsSchema)
  return loadRotationReply(useDB(), id)
})
