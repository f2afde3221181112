// start/end: ISO instants with an offset, or whole UTC days YYYY-MM-DD (the end day is included).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, UnavailabilityBodySchema)
  const span = createBlockedSpan(useDB(), actor.id, body)
  setResponseStatus(event, 201)
  return span
})
