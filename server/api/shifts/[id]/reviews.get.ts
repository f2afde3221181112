import { eq } from 'drizzle-orm'
import { shifts } from '../../../db/schema'
import { IdParamsSchema } from '../../../utils/validation'

// Every decision made on a shift, newest first, with who made it and whether it still applies.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'safety', 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const shift = useDB().select({ id: shifts.id, reviewState: shifts.reviewState }).from(shifts).where(eq(shifts.id, id)).get()
  if (!shift) throw notFound('Shift')
  return listShiftReviews(useDB(), shift)
})
