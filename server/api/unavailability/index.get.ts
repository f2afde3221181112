// Blocked spans overlapping ?from=&to= (whole UTC days YYYY-MM-DD, both inclusive, or ISO instants).
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = readQueryAs(event, UnavailabilityQuerySchema)
  return listBlockedSpans(useDB(), query)
})
