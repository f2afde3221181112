import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  const viewer = await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const person = findPersonPublic(id, viewer)
  if (!person) throw notFound('Person')
  return person
})
