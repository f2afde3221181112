import { computeLightDays } from '../core/light/index'

const cache = createReplyCache(300)

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const q = readQueryAs(event, LightQuerySchema)
  const key = JSON.stringify([q.lat, q.lon, q.tz, q.from, q.to])
  setHeader(event, 'content-type', 'application/json; charset=utf-8')
  // the light of a place and dates never changes: compute it once per distinct request
  return cache.get(key) ?? cache.set(key, JSON.stringify({
    latitude: q.lat,
    longitude: q.lon,
    timezone: q.tz,
    days: computeLightDays({ latitude: q.lat, longitude: q.lon, timezone: q.tz, from: q.from, to: q.to })
  }))
})
