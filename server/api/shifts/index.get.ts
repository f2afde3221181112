export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = readQueryAs(event, ShiftListQuerySchema)
  return findShiftsInRange(useDB(), query)
})
