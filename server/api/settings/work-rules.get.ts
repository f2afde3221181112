export default defineEventHandler(async (event) => {
  await requireRole(event)
  return loadWorkRules(useDB())
})
