import type { ShiftReply } from '../../../shared/types/shift'

const cache = createReplyCache<ShiftReply[]>(200)

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const query = readQueryAs(event, ShiftListQuerySchema)
  // crew members see their own shifts only; coordinators and safety officers see all
  const scoped = user.role === 'crew' ? { ...query, personId: user.id } : query
  const db = useDB()
  // the calendar asks for the same week again and again: reuse the reply (and its compressed
  // bytes) until any row changes, in this worker or another
  const key = `${readDataStamp(db)}|${JSON.stringify(scoped)}`
  return sendCachedReply(event, cache.remember(key, () => findShiftsInRange(db, scoped)))
})
