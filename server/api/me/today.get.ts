// Today and tomorrow for the signed-in person at each site where they work in the next 7 days:
// the light window, their shifts with light state and review, the weather and the cautions.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return buildCrewToday(useDB(), user.id)
})
