import { computeLightDays } from '../core/light/index'
import { attachMoonToDays, type MoonDay } from '../core/light/moon'
import type { LightDay } from '../../shared/light'

const cache = createReplyCache<{ latitude: number, longitude: number, timezone: string, days: (LightDay & { moon: MoonDay })[] }>(300)

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const q = readQueryAs(event, LightQuerySchema)
  const key = JSON.stringify([q.lat, q.lon, q.tz, q.from, q.to])
  // the light of a place and dates never changes: compute and compress it once per distinct request
  return sendCachedReply(event, cache.remember(key, () => ({
    latitude: q.lat,
    longitude: q.lon,
    timezone: q.tz,
    days: attachMoonToDays(computeLightDays({ latitude: q.lat, longitude: q.lon, timezone: q.tz, from: q.from, to: q.to }), { latitude: q.lat, longitude: q.lon, timezone: q.tz })
  })))
})
