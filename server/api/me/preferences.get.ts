// The signed-in person's own preferences: reminders on or off, the zone times are shown in, sun events in the feed.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return readPersonPreferences(useDB(), user.id)
})
