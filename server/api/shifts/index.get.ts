const cache = createReplyCache(200)

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const query = readQueryAs(event, ShiftListQuerySchema)
  // crew members see their own shifts only; coordinators and safety officers see all
  const scoped = user.role === 'crew' ? { ...query, personId: user.id } : query
  const db = useDB()
  // the calendar asks for the same week again and again: reuse the reply until any row changes
  const key = `${readDataStamp(db)}|${JSON.stringify(scoped)}`
  setHeader(event, 'content-type', 'application/json; charset=utf-8')
  return cache.get(key) ?? cache.set(key, JSON.stringify(findShiftsInRange(db, scoped)))
})
