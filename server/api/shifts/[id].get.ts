import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const shift = findShiftView(useDB(), id)
  // a crew member asking for someone else's shift learns nothing, not even that it exists
  if (!shift || (user.role === 'crew' && !shift.assigneeIds.includes(user.id))) throw notFound('Shift')
  return shift
})
