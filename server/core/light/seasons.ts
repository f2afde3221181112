// The light seasons of a site: stretches of midnight sun, polar night and days without civil light,
// the solstices and equinoxes, and the next seasonal changes after a date. Built on the light engine.
// Pure TypeScript, no framework imports.
import {
  DEFAULT_MIN_CIVIL_HOURS,
  type LightDayMs,
  type LightTransitions,
  type LocalDateSpan,
  type SeasonSummary,
  type SunriseBearing,
  LIGHT_FIRST_YEAR,
  LIGHT_LAST_YEAR
} from '../../../shared/light'
import { computeLightDaysMs } from './index'
import { formatInstantInZone, shiftLocalDate } from '../time/zone-table'
import { sampleSunDeclination, solveRootBrent } from '../sun/position'

const DAY_MS = 86_400_000
const HOUR_MS = 3_600_000

export interface SeasonsInput {
  latitude: number
  longitude: number
  timezone: string
  year: number
  /** N of "days with at least N hours of civil light"; default 4. */
  minCivilHours?: number
}

export interface TransitionsInput {
  latitude: number
  longitude: number
  timezone: string
  /** The local date to look ahead from, YYYY-MM-DD (a change on that date itself counts). */
  today: string
  minCivilHours?: number
}

export interface SeasonInstantsMs {
  marchEquinoxMs: number
  juneSolsticeMs: number
  septemberEquinoxMs: number
  decemberSolsticeMs: number
}

function validateYear(year: number) {
  if (!Number.isInteger(year) || year < LIGHT_FIRST_YEAR || year > LIGHT_LAST_YEAR) throw new RangeError(`year must be a whole year from ${LIGHT_FIRST_YEAR} to ${LIGHT_LAST_YEAR}, got ${year}`)
}

function validateMinCivilHours(hours: number | undefined): number {
  const value = hours ?? DEFAULT_MIN_CIVIL_HOURS
  if (!Number.isFinite(value) || value < 0 || value > 24) throw new RangeError(`minCivilHours must be a number from 0 to 24, got ${hours}`)
  return value
}

// Rate of change of the declination around ms, by a centred difference over ±1 h: its zero is the
// solstice (the offset from the true stationary point is h²·δ‴/(6·δ″) ≈ 0.4 s).
function declinationSlope(ms: number): number {
  return sampleSunDeclination(ms + HOUR_MS) - sampleSunDeclination(ms - HOUR_MS)
}

/**
 * Equinoxes and solstices of a year from suncalc's own sun: the equinoxes where its apparent
 * declination crosses zero (its ecliptic latitude is zero, so δ = 0 ⇔ longitude 0° or 180°), the
 * solstices where the declination is stationary (longitude 90° or 270°). Daily samples, then Brent's
 * method to a second. suncalc's low-precision solar series limits these to about ±15 minutes.
 */
export function computeSeasonInstants(year: number): SeasonInstantsMs {
  validateYear(year)
  const start = Date.UTC(year, 0, 1)
  const count = Math.round((Date.UTC(year + 1, 0, 1) - start) / DAY_MS) + 1
  const dec = Array.from({ length: count }, (_, i) => sampleSunDeclination(start + i * DAY_MS))
  const found: Partial<SeasonInstantsMs> = {}
  for (let i = 1; i < count; i++) {
    const a = start + (i - 1) * DAY_MS
    if (dec[i - 1]! < 0 && dec[i]! >= 0) found.marchEquinoxMs = solveRootBrent(sampleSunDeclination, a, a + DAY_MS, dec[i - 1]!, dec[i]!, 1000)
    if (dec[i - 1]! >= 0 && dec[i]! < 0) found.septemberEquinoxMs = solveRootBrent(sampleSunDeclination, a, a + DAY_MS, dec[i - 1]!, dec[i]!, 1000)
    if (i + 1 >= count) continue
    const peak = dec[i]! > dec[i - 1]! && dec[i]! >= dec[i + 1]!
    const trough = dec[i]! < dec[i - 1]! && dec[i]! <= dec[i + 1]!
    if (!peak && !trough) continue
    const root = solveRootBrent(declinationSlope, a, a + 2 * DAY_MS, declinationSlope(a), declinationSlope(a + 2 * DAY_MS), 1000)
    if (peak) found.juneSolsticeMs = root
    else found.decemberSolsticeMs = root
  }
  const { marchEquinoxMs, juneSolsticeMs, septemberEquinoxMs, decemberSolsticeMs } = found
  if (marchEquinoxMs === undefined || juneSolsticeMs === undefined || septemberEquinoxMs === undefined || decemberSolsticeMs === undefined) {
    throw new RangeError(`no complete set of solstices and equinoxes found in ${year}`)
  }
  return { marchEquinoxMs, juneSolsticeMs, septemberEquinoxMs, decemberSolsticeMs }
}

function civilLightMs(day: LightDayMs): number {
  let total = 0
  for (const p of day.periods) if (p.kind === 'day' || p.kind === 'civil') total += p.endMs - p.startMs
  return total
}

/** Runs of consecutive local dates for which the test holds, as inclusive spans. */
function collectSpans(days: LightDayMs[], test: (day: LightDayMs) => boolean): LocalDateSpan[] {
  const spans: LocalDateSpan[] = []
  let open: LocalDateSpan | null = null
  for (const day of days) {
    if (!test(day)) {
      open = null
      continue
    }
    if (open) open.to = day.date
    else spans.push(open = { from: day.date, to: day.date })
  }
  return spans
}

// Sunrises closest to due north and to due south. Compared by cos(azimuth), so that a bearing just
// west of north (e.g. 358°) counts as near north too.
function findSunriseExtremes(days: LightDayMs[]) {
  let north: SunriseBearing | null = null
  let south: SunriseBearing | null = null
  for (const day of days) {
    for (const event of day.events) {
      if (event.type !== 'sunrise') continue
      const northness = Math.cos(event.azimuth * Math.PI / 180)
      if (!north || northness > Math.cos(north.azimuth * Math.PI / 180)) north = { azimuth: event.azimuth, date: day.date }
      if (!south || northness < Math.cos(south.azimuth * Math.PI / 180)) south = { azimuth: event.azimuth, date: day.date }
    }
  }
  return { north, south }
}

/**
 * The light seasons of a site over a calendar year: spans of midnight sun, polar night and days with
 * no civil light at all; the first and last dates with at least minCivilHours of civil light; the
 * solstices and equinoxes in the site's offset; and the sunrises farthest north and south.
 */
export function computeSeasons(input: SeasonsInput): SeasonSummary {
  validateYear(input.year)
  const minCivilHours = validateMinCivilHours(input.minCivilHours)
  const { latitude, longitude, timezone, year } = input
  const days = computeLightDaysMs({ latitude, longitude, timezone, from: `${year}-01-01`, to: `${year}-12-31` })
  const enough = days.filter(day => civilLightMs(day) >= minCivilHours * HOUR_MS)
  const instants = computeSeasonInstants(year)
  const { north, south } = findSunriseExtremes(days)
  return {
    latitude, longitude, timezone, year, minCivilHours,
    midnightSun: collectSpans(days, day => day.status === 'midnight-sun'),
    polarNight: collectSpans(days, day => day.status === 'polar-night'),
    noCivilLight: collectSpans(days, day => civilLightMs(day) === 0),
    firstDayWithCivilHours: enough[0]?.date ?? null,
    lastDayWithCivilHours: enough[enough.length - 1]?.date ?? null,
    marchEquinox: formatInstantInZone(instants.marchEquinoxMs, timezone),
    juneSolstice: formatInstantInZone(instants.juneSolsticeMs, timezone),
    septemberEquinox: formatInstantInZone(instants.septemberEquinoxMs, timezone),
    decemberSolstice: formatInstantInZone(instants.decemberSolsticeMs, timezone),
    northernmostSunrise: north,
    southernmostSunrise: south
  }
}

// First date from days[1] on at which the test turns true (begins) and turns false (ends).
function findChange(days: LightDayMs[], test: (day: LightDayMs) => boolean) {
  let begins: string | null = null
  let ends: string | null = null
  for (let i = 1; i < days.length && (begins === null || ends === null); i++) {
    const before = test(days[i - 1]!)
    const now = test(days[i]!)
    if (now && !before && begins === null) begins = days[i]!.date
    if (!now && before && ends === null) ends = days[i]!.date
  }
  return { begins, ends }
}

/**
 * The next seasonal changes from `today` (inclusive) through the following 365 days: when polar
 * night and midnight sun next begin and end, and when civil light next falls below or reaches
 * minCivilHours. "Ends" is the first date no longer in that state. null where none falls in the window.
 */
export function findNextTransitions(input: TransitionsInput): LightTransitions {
  const minCivilHours = validateMinCivilHours(input.minCivilHours)
  const { latitude, longitude, timezone, today } = input
  const days = computeLightDaysMs(
    { latitude, longitude, timezone, from: shiftLocalDate(today, -1), to: shiftLocalDate(today, 365) },
    { maxDays: 367 }
  )
  const polar = findChange(days, day => day.status === 'polar-night')
  const midnight = findChange(days, day => day.status === 'midnight-sun')
  const civil = findChange(days, day => civilLightMs(day) >= minCivilHours * HOUR_MS)
  const current = days[1]!
  return {
    today, minCivilHours, status: current.status, civilLightMinutes: current.civilLightMinutes,
    polarNightBegins: polar.begins,
    polarNightEnds: polar.ends,
    midnightSunBegins: midnight.begins,
    midnightSunEnds: midnight.ends,
    civilLightFallsBelow: civil.ends,
    civilLightReaches: civil.begins
  }
}
