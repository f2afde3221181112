import { IdParamsSchema } from '../../utils/validation'

// One message as it was (or will be) sent: its HTML, plain text and delivery record.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const message = findOutboxMessage(useDB(), id)
  if (!message) throw notFound('Message')
  return message
})
