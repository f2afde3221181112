export default defineEventHandler(async (event) => {
  await requireRole(event)
  const q = readQueryAs(event, LightQuerySchema)
  const days = computeLightDays({ latitude: q.lat, longitude: q.lon, timezone: q.tz, from: q.from, to: q.to })
  return { latitude: q.lat, longitude: q.lon, timezone: q.tz, days }
})
