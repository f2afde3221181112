// The operator's overdue grace, lone-worker check-in interval and escalation interval.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  return loadFieldSettings(useDB())
})
