// Blocked spans overlapping ?from=&to= (whole UTC days YYYY-MM-DD, both inclusive, or ISO instants).
export default defineEventHandler(async (event) => {
  const viewer = await requireRole(event)
  const query = readQueryAs(event, UnavailabilityQuerySchema)
  const spans = listBlockedSpans(useDB(), query)
  // crew see when colleagues are away, not why
  return viewer.role === 'crew' ? spans.map(s => (s.personId === viewer.id ? s : { ...s, reason: '' })) : spans
})
