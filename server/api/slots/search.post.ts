// Proposes slots for a task at a site: wholly in the light it needs, clear of the people's other
// shifts, blocked spans and work rules. `from` and `to` are local dates in the site's zone, both
// inclusive, at most 90 days. Searching writes nothing; a slot becomes a shift through POST /api/shifts.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, SlotSearchBodySchema)
  return searchSlots(useDB(), body)
})
