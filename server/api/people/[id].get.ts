import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const person = findPersonPublic(id)
  if (!person) throw notFound('Person')
  return person
})
