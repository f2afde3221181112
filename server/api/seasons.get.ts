import { computeSeasons } from '../core/light/seasons'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const q = readQueryAs(event, SeasonsQuerySchema)
  return computeSeasons({ latitude: q.lat, longitude: q.lon, timezone: q.tz, year: q.year, minCivilHours: q.minCivilHours })
})
