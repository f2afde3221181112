export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const query = readQueryAs(event, ShiftListQuerySchema)
  // crew members see their own shifts only; coordinators and safety officers see all
  return findShiftsInRange(useDB(), user.role === 'crew' ? { ...query, personId: user.id } : query)
})
