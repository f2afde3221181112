// Copies a site's week of shifts into the weeks after it, same wall-clock times (coordinator).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, WeekCopyBodySchema)
  const result = copySiteWeek(useDB(), actor, body)
  setResponseStatus(event, 201)
  return result
})
