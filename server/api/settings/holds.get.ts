// The operator's weather-hold levels, mildest first (any signed-in role may read them).
export default defineEventHandler(async (event) => {
  await requireRole(event)
  return loadHoldSettings(useDB())
})
