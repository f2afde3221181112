// The year chart's data: every local day of a year at a site as compact bands (minutes since local
// midnight), with the day's light figures, sunrise and sunset azimuths, the clock changes of the
// zone and the solstices and equinoxes. Built on the light engine; pure TypeScript, no framework imports.
import type { LightDayMs, SeasonSummary } from '../../../shared/light'
import type { AzimuthExtreme, ClockChange, CompactPeriod, SeasonMarker, YearChartData, YearChartDay } from '../../../shared/outlook'
import { computeLightDaysMs } from './index'
import { formatInstantInZone } from '../time/zone-table'
import { computeSeasonInstants } from './seasons'

const MINUTE_MS = 60_000
const DAY_MS = 86_400_000

export interface YearChartInput {
  siteId: number
  latitude: number
  longitude: number
  timezone: string
  year: number
}

function offsetAt(ms: number, timezone: string): string {
  return formatInstantInZone(ms, timezone).slice(19)
}

function offsetMinutes(offset: string): number {
  const sign = offset.startsWith('-') ? -1 : 1
  const [h, m] = offset.slice(1).split(':').map(Number) as [number, number]
  return sign * (h * 60 + m)
}

/** The clock change inside a local day (or at its midnight), found to the second by bisection; undefined on a plain 24-hour day. */
export function findClockChange(day: Pick<LightDayMs, 'date' | 'startMs' | 'endMs'>, timezone: string): ClockChange | undefined {
  // a change of offset always lengthens or shortens the local day (the tz data never changes twice in one)
  if (day.endMs - day.startMs === DAY_MS) return undefined
  // the next local midnight is already on the new offset, even when the change falls exactly on it
  const toOffset = offsetAt(day.endMs, timezone)
  let fromOffset = offsetAt(day.startMs, timezone)
  const change = (atMinute: number) => ({ date: day.date, atMinute, fromOffset, toOffset, shiftMinutes: offsetMinutes(toOffset) - offsetMinutes(fromOffset) })
  if (fromOffset === toOffset) {
    // the clocks changed at this local midnight itself, so the day begins on the new offset (e.g. at 01:00)
    fromOffset = offsetAt(day.startMs - 1000, timezone)
    return fromOffset === toOffset ? undefined : change(0)
  }
  let lo = day.startMs
  let hi = day.endMs
  while (hi - lo > 1000) {
    const mid = lo + Math.floor((hi - lo) / 2000) * 1000
    if (offsetAt(mid, timezone) === fromOffset) lo = mid
    else hi = mid
  }
  return change(Math.round((hi - day.startMs) / MINUTE_MS))
}

/** A day's periods as [kind, startMinute, endMinute]; bands shorter than a minute fold into their neighbours. */
export function compactPeriods(day: Pick<LightDayMs, 'startMs' | 'periods'>): CompactPeriod[] {
  const out: CompactPeriod[] = []
  for (const p of day.periods) {
    const start = Math.round((p.startMs - day.startMs) / MINUTE_MS)
    const end = Math.round((p.endMs - day.startMs) / MINUTE_MS)
    if (end <= start) continue
    const last = out[out.length - 1]
    if (last && last[0] === p.kind) last[2] = end
    else if (last) {
      last[2] = start
      out.push([p.kind, start, end])
    } else out.push([p.kind, 0, end])
  }
  return out
}

function toChartDay(day: LightDayMs): YearChartDay {
  const sunrise = day.events.find(e => e.type === 'sunrise')
  const sunset = day.events.filter(e => e.type === 'sunset').pop()
  return {
    date: day.date,
    minutes: Math.round((day.endMs - day.startMs) / MINUTE_MS),
    periods: compactPeriods(day),
    daylightMinutes: day.daylightMinutes,
    civilLightMinutes: day.civilLightMinutes,
    sunriseAzimuth: sunrise ? sunrise.azimuth : null,
    sunsetAzimuth: sunset ? sunset.azimuth : null,
    status: day.status
  }
}

// Extreme azimuths of every sunrise and sunset of the year (not only the first of each day).
function findAzimuthExtremes(days: LightDayMs[]): YearChartData['horizon'] {
  const pick = (type: 'sunrise' | 'sunset', better: (a: number, b: number) => boolean) => {
    let best: AzimuthExtreme | null = null
    for (const day of days) {
      for (const e of day.events) {
        if (e.type === type && (!best || better(e.azimuth, best.azimuth))) best = { date: day.date, azimuth: e.azimuth }
      }
    }
    return best
  }
  // Sunrises lie in the eastern half (0–180°) and sunsets in the western (180–360°) at every latitude:
  // the sun's lowest point is due north or due south, so the northernmost sunrise has the smallest azimuth.
  return {
    northernmostSunrise: pick('sunrise', (a, b) => a < b),
    southernmostSunrise: pick('sunrise', (a, b) => a > b),
    northernmostSunset: pick('sunset', (a, b) => a > b),
    southernmostSunset: pick('sunset', (a, b) => a < b)
  }
}

function toMarker(kind: SeasonMarker['kind'], value: string, timezone: string): SeasonMarker {
  const ms = Date.parse(value)
  const at = formatInstantInZone(ms, timezone)
  return { kind, date: at.slice(0, 10), at }
}

/** Season markers of a year from the light engine's season summary. */
export function buildSeasonMarkers(seasons: Pick<SeasonSummary, 'marchEquinox' | 'juneSolstice' | 'septemberEquinox' | 'decemberSolstice'>, timezone: string): SeasonMarker[] {
  return [
    toMarker('march-equinox', seasons.marchEquinox, timezone),
    toMarker('june-solstice', seasons.juneSolstice, timezone),
    toMarker('september-equinox', seasons.septemberEquinox, timezone),
    toMarker('december-solstice', seasons.decemberSolstice, timezone)
  ]
}

/** Assembles the year chart from the engine's days and season summary (no astronomy of its own). */
export function composeYearChart(input: YearChartInput, days: LightDayMs[], seasons: Pick<SeasonSummary, 'marchEquinox' | 'juneSolstice' | 'septemberEquinox' | 'decemberSolstice'>): YearChartData {
  const clockChanges: ClockChange[] = []
  for (const day of days) {
    const change = findClockChange(day, input.timezone)
    if (change) clockChanges.push(change)
  }
  return {
    siteId: input.siteId,
    year: input.year,
    latitude: input.latitude,
    longitude: input.longitude,
    timezone: input.timezone,
    days: days.map(toChartDay),
    clockChanges,
    markers: buildSeasonMarkers(seasons, input.timezone),
    horizon: findAzimuthExtremes(days)
  }
}

/** The year chart of one site and year: every local day from 1 January to 31 December. */
export function computeYearChart(input: YearChartInput): YearChartData {
  const place = { latitude: input.latitude, longitude: input.longitude, timezone: input.timezone }
  const days = computeLightDaysMs({ ...place, from: `${input.year}-01-01`, to: `${input.year}-12-31` })
  // the engine's season instants alone: computeSeasons would trace the same year a second time
  const instants = computeSeasonInstants(input.year)
  const iso = (ms: number) => new Date(ms).toISOString()
  return composeYearChart(input, days, {
    marchEquinox: iso(instants.marchEquinoxMs),
    juneSolstice: iso(instants.juneSolsticeMs),
    septemberEquinox: iso(instants.septemberEquinoxMs),
    decemberSolstice: iso(instants.decemberSolsticeMs)
  })
}
