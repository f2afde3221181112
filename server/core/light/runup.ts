// The run-up to (or out of) polar night at a site: how many days still have N hours of civil light,
// the last sunrise, the day civil light falls below N hours and the first sunrise after polar night.
// Built on the light engine's local days; pure TypeScript, no framework imports.
import type { LightDayMs, LightTransitions } from '../../../shared/light'
import type { BoardTransition, LightTrend, RunupDay, RunupSummary } from '../../../shared/outlook'
import { computeLightDaysMs } from './index'
import { shiftLocalDate } from '../time/zone-table'

/** Days searched ahead: more than a year, so a polar night that began just before `from` still shows its end. */
export const RUNUP_HORIZON_DAYS = 400
/** Days looked back when `from` falls inside a polar night or midnight sun, to find where it began (the longest polar night, at the pole, is under 190 days). */
const RUNUP_LOOKBACK_DAYS = 190
const SERIES_DAYS = 200
const DAY_MS = 86_400_000

// Civil light to the millisecond, as the season summary counts it (the whole minutes are rounded).
function civilLightMs(day: LightDayMs): number {
  let total = 0
  for (const p of day.periods) if (p.kind === 'day' || p.kind === 'civil') total += p.endMs - p.startMs
  return total
}

export interface RunupInput {
  siteId: number
  latitude: number
  longitude: number
  timezone: string
  /** Local date to count from, YYYY-MM-DD. */
  from: string
  minCivilHours: number
  horizonDays?: number
  /** Days looked back to find where a current polar night or midnight sun began (default 190; 0 skips it). */
  lookbackDays?: number
}

function toRunupDay(day: LightDayMs): RunupDay {
  return { date: day.date, civilLightMinutes: day.civilLightMinutes, daylightMinutes: day.daylightMinutes, status: day.status }
}

// First index ≥ start at which `test` holds, or −1.
function findIndexFrom<T>(items: T[], start: number, test: (item: T, i: number) => boolean): number {
  for (let i = start; i < items.length; i++) if (test(items[i]!, i)) return i
  return -1
}

// A longer day has a higher noon sun: comparing noon altitudes a week apart gives the trend even
// in midnight sun or polar night, where day length does not change.
function findTrend(days: LightDayMs[]): LightTrend {
  const later = days[Math.min(7, days.length - 1)]!
  return later.maxAltitude < days[0]!.maxAltitude ? 'darkening' : 'brightening'
}

/** Index of the first day of the status stretch that contains or follows index `at` (the stretch may start before `at`). */
function findStretchStart(days: LightDayMs[], at: number, status: LightDayMs['status']): number {
  let i = findIndexFrom(days, at, d => d.status === status)
  if (i < 0) return -1
  while (i > 0 && days[i - 1]!.status === status) i--
  return i
}

/** Summarises the run-up from the first of `days` (which may start up to a lookback before `from`). */
export function summarizeRunup(days: LightDayMs[], from: string, minCivilHours: number, meta: { siteId: number, timezone: string }): RunupSummary {
  const at = days.findIndex(d => d.date === from)
  if (at < 0) throw new RangeError(`from ${from} is not among the days given`)
  const ahead = days.slice(at)
  const needMs = minCivilHours * 3_600_000
  const civilOk = (d: LightDayMs) => civilLightMs(d) >= needMs
  const fallsAt = findIndexFrom(ahead, 1, (d, i) => !civilOk(d) && civilOk(ahead[i - 1]!))
  const reachesAt = findIndexFrom(ahead, 1, (d, i) => civilOk(d) && !civilOk(ahead[i - 1]!))
  const nightStart = findStretchStart(days, at, 'polar-night')
  const nightEnd = nightStart < 0 ? -1 : findIndexFrom(days, nightStart, d => d.status !== 'polar-night')
  let lastRise = -1
  for (let i = nightStart - 1; i >= 0 && lastRise < 0; i--) if (days[i]!.events.some(e => e.type === 'sunrise')) lastRise = i
  const sunStart = findStretchStart(days, at, 'midnight-sun')
  const sunEnd = sunStart < 0 ? -1 : findIndexFrom(days, sunStart, d => d.status !== 'midnight-sun')
  const dateAt = (i: number) => (i >= 0 ? days[i]!.date : null)
  return {
    siteId: meta.siteId,
    timezone: meta.timezone,
    from,
    minCivilHours,
    trend: findTrend(ahead),
    today: toRunupDay(ahead[0]!),
    daysLeftWithCivilHours: !civilOk(ahead[0]!) ? 0 : fallsAt < 0 ? null : fallsAt,
    civilLightFallsBelow: fallsAt < 0 ? null : ahead[fallsAt]!.date,
    civilLightReaches: reachesAt < 0 ? null : ahead[reachesAt]!.date,
    lastSunrise: nightStart > 0 ? dateAt(lastRise) : null,
    polarNightBegins: nightStart > 0 ? dateAt(nightStart) : null,
    firstSunriseAfterPolarNight: dateAt(nightEnd),
    polarNightDays: nightStart > 0 && nightEnd > 0 ? nightEnd - nightStart : null,
    midnightSunBegins: sunStart > 0 ? dateAt(sunStart) : null,
    midnightSunEnds: dateAt(sunEnd),
    horizonDays: ahead.length,
    series: ahead.slice(0, SERIES_DAYS).map(toRunupDay)
  }
}

/** The run-up at a site from a local date, searching `horizonDays` ahead (default 400). */
export function computeRunup(input: RunupInput): RunupSummary {
  const horizon = input.horizonDays ?? RUNUP_HORIZON_DAYS
  const start = shiftLocalDate(input.from, -(input.lookbackDays ?? RUNUP_LOOKBACK_DAYS))
  const days = computeLightDaysMs({
    latitude: input.latitude,
    longitude: input.longitude,
    timezone: input.timezone,
    from: start,
    to: shiftLocalDate(input.from, horizon - 1)
  }, { maxDays: 800 })
  return summarizeRunup(days, input.from, input.minCivilHours, { siteId: input.siteId, timezone: input.timezone })
}

/** The soonest of the light engine's next seasonal changes (a change today counts), for the light board. */
export function findNextTransition(next: LightTransitions): BoardTransition | null {
  const candidates: [BoardTransition['kind'], string | null][] = [
    ['polar-night-begins', next.polarNightBegins],
    ['polar-night-ends', next.polarNightEnds],
    ['midnight-sun-begins', next.midnightSunBegins],
    ['midnight-sun-ends', next.midnightSunEnds],
    ['civil-falls-below', next.civilLightFallsBelow],
    ['civil-reaches', next.civilLightReaches]
  ]
  let best: BoardTransition | null = null
  for (const [kind, date] of candidates) {
    if (!date || date < next.today) continue
    const inDays = Math.round((Date.parse(`${date}T00:00:00Z`) - Date.parse(`${next.today}T00:00:00Z`)) / DAY_MS)
    if (!best || inDays < best.inDays) best = { kind, date, inDays }
  }
  return best
}
