import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const shift = findShiftView(useDB(), id)
  if (!shift) throw notFound('Shift')
  return shift
})
