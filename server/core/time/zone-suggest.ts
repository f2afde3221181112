// Suggests a site's IANA zone from its coordinates (an offline boundary lookup, no network) and warns
// when the zone's clock is far from the sun's time at that longitude: there "noon" on the clock is
// hours from the sun's highest point, which surprises people planning around light.
// Pure: no framework or database imports.
import lookupZoneAt from '@photostructure/tz-lookup'
import { formatDuration } from '../../../shared/format'
import { zoneOffsetMinutes } from './zone-table'
import { nowMs as clockNowMs } from './clock'

/** Beyond this gap between zone time and local mean solar time, the suggestion carries a warning. */
export const SOLAR_GAP_WARNING_MINUTES = 90
// the Earth turns 360° in 24 h: 4 minutes of clock time per degree of longitude
const MINUTES_PER_DEGREE = 4
// neighbours sampled about 25 km away, so a site near a zone border sees the zones on both sides
const NEARBY_KM = 25
const KM_PER_DEGREE_LATITUDE = 111.2

export interface ZoneSolarGap {
  timezone: string
  zoneOffsetMinutes: number
  solarOffsetMinutes: number
  differenceMinutes: number
  warning: string | null
}

export interface ZoneSuggestion extends ZoneSolarGap {
  candidates: string[]
}

function isKnownZone(tz: string) {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz })
    return true
  } catch {
    return false
  }
}

// The nautical zone for a longitude (Etc/GMT signs are inverted by POSIX convention: Etc/GMT+2 is UTC−2).
function nauticalZoneFor(longitude: number) {
  const hours = Math.round(longitude / 15)
  if (hours === 0) return 'Etc/GMT'
  return hours > 0 ? `Etc/GMT-${hours}` : `Etc/GMT+${-hours}`
}

function lookupKnownZone(latitude: number, longitude: number): string {
  const zone = lookupZoneAt(latitude, longitude)
  return isKnownZone(zone) ? zone : nauticalZoneFor(longitude)
}

function wrapLongitude(longitude: number) {
  return ((longitude + 540) % 360) - 180
}

/** The zones at a point and about 25 km around it, the point's own zone first. */
export function findNearbyZones(latitude: number, longitude: number): string[] {
  const dLat = NEARBY_KM / KM_PER_DEGREE_LATITUDE
  const dLon = Math.min(5, dLat / Math.max(0.05, Math.cos(latitude * Math.PI / 180)))
  const zones = [lookupKnownZone(latitude, longitude)]
  for (const [y, x] of [[1, 0], [1, 1], [0, 1], [-1, 1], [-1, 0], [-1, -1], [0, -1], [1, -1]] as const) {
    const lat = Math.max(-90, Math.min(90, latitude + y * dLat))
    zones.push(lookupKnownZone(lat, wrapLongitude(longitude + x * dLon)))
  }
  return [...new Set(zones)]
}

function describeGap(timezone: string, gapMinutes: number, season: string) {
  const ahead = gapMinutes > 0
  const noon = (((12 * 60 + gapMinutes) % 1440) + 1440) % 1440
  const clock = `${String(Math.floor(noon / 60)).padStart(2, '0')}:${String(noon % 60).padStart(2, '0')}`
  return `Clocks on ${timezone} time run ${formatDuration(gapMinutes)} ${ahead ? 'ahead of' : 'behind'} the sun at this longitude${season}: `
    + `solar noon, when the sun is highest, comes at about ${clock} on the clock rather than near 12:00. `
    + 'Check that this is the zone the crew works by; the light bands follow the sun either way.'
}

// The worse of the zone's January and July offsets, so a zone that is only far off in daylight-saving
// time still warns in winter.
function findWorstSeasonGap(timezone: string, solarOffsetMinutes: number, nowMs: number) {
  const year = new Date(nowMs).getUTCFullYear()
  const offsets = [Date.UTC(year, 0, 15), Date.UTC(year, 6, 15)].map(ms => zoneOffsetMinutes(ms, timezone))
  const [winter, summer] = offsets as [number, number]
  const gaps = offsets.map(o => o - solarOffsetMinutes)
  const worst = Math.abs(gaps[0]!) >= Math.abs(gaps[1]!) ? 0 : 1
  const dstOffset = Math.max(winter, summer)
  const season = winter === summer ? '' : offsets[worst] === dstOffset ? ' while daylight-saving time is in force' : ' in standard time'
  return { gap: gaps[worst]!, season }
}

/** How far a zone's clock is from the sun's time at a longitude, with a warning past 90 minutes. */
export function describeZoneSolarGap(timezone: string, longitude: number, nowMs = clockNowMs()): ZoneSolarGap {
  const zoneOffset = zoneOffsetMinutes(nowMs, timezone)
  const solarOffsetMinutes = Math.round(longitude * MINUTES_PER_DEGREE)
  const worst = findWorstSeasonGap(timezone, solarOffsetMinutes, nowMs)
  return {
    timezone,
    zoneOffsetMinutes: zoneOffset,
    solarOffsetMinutes,
    differenceMinutes: zoneOffset - solarOffsetMinutes,
    warning: Math.abs(worst.gap) > SOLAR_GAP_WARNING_MINUTES ? describeGap(timezone, worst.gap, worst.season) : null
  }
}

/** The zone suggested for coordinates, the zones nearby, and how far its clock is from the sun. */
export function suggestTimeZone(latitude: number, longitude: number, nowMs = clockNowMs()): ZoneSuggestion {
  const candidates = findNearbyZones(latitude, longitude)
  return { ...describeZoneSolarGap(candidates[0]!, longitude, nowMs), candidates }
}
