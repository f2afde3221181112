// The light engine: splits the local days of a site into the bands of DESIGN.md ("The light model")
// using suncalc's position function only. It samples the altitude on one UTC grid over the whole
// range, refines every highest and lowest point (Brent minimisation), finds every threshold crossing
// on the monotone pieces between them (Brent's method, to under a second), then cuts the result at
// the local midnights of the site's IANA zone. Pure TypeScript: no framework imports.
import {
  BAND_KINDS_ASCENDING,
  BAND_THRESHOLDS_ASCENDING_DEG,
  MAX_LIGHT_RANGE_DAYS,
  RISING_EVENT_BY_THRESHOLD,
  SETTING_EVENT_BY_THRESHOLD,
  type BandKind,
  type DayStatus,
  type LightDay,
  type LightDayMs,
  type LightPeriodMs,
  type SunEventMs
} from '../../../shared/light'
import {
  SUNCALC_HORIZON_REFRACTION_DEG,
  convertApparentToGeometric,
  minimizeBrent,
  normalizeSunLatitude,
  normalizeSunLongitude,
  sampleSunAltitude,
  sampleSunApparentAltitude,
  sampleSunPosition,
  solveRootNearGuess
} from '../sun/position'

const MINUTE_MS = 60_000
const HOUR_MS = 3_600_000
const DAY_MS = 86_400_000

// Spacing of the altitude samples. The sun's altitude is a smooth curve with one highest and one
// lowest point per ~24 h (at least ~6 h apart short of the last hundredth of a degree at the poles), so
// a 2-hour grid shows each of them as a local extreme of the samples; each is then refined to the
// true extremum, and the crossings are searched on the monotone pieces between them, so a dip past a
// threshold between two samples is not missed however shallow it is.
const GRID_STEP_MS = 2 * HOUR_MS
// Brent's method stops once the crossing is bracketed within 1 s; the estimate inside that bracket is
// then rounded to the whole second reported.
const ROOT_TOLERANCE_MS = 1_000
// A few seconds off the true peak moves its altitude by under 1e-6°, far below the 0.01° reported.
const EXTREMUM_TOLERANCE_MS = 5_000
// Half-spacing of the three samples that confirm a predicted extremum.
const EXTREMUM_PROBE_MS = 30_000
// Day-to-day predictions are trusted only for a steady daily series.
const PREDICTION_MAX_WOBBLE_MS = 10 * MINUTE_MS
const THRESHOLDS = BAND_THRESHOLDS_ASCENDING_DEG

interface TraceCrossing {
  ms: number
  /** Index into BAND_THRESHOLDS_ASCENDING_DEG. */
  level: number
  rising: boolean
  azimuth: number
}

interface TraceExtremum {
  ms: number
  /** Geometric altitude, degrees. */
  altitude: number
  isMax: boolean
}

interface SunTrace {
  /** Band index (0 night … 4 day) at fromMs, sampled directly. */
  startBand: number
  /** Crossings in time order; a few just before fromMs may be included. */
  crossings: TraceCrossing[]
  extrema: TraceExtremum[]
  /** Grid samples and refined extrema in time order (apparent altitude): monotone between neighbours over [fromMs, toMs]. */
  times: Float64Array
  alts: Float64Array
}

export interface LightDaysInput {
  latitude: number
  longitude: number
  timezone: string
  /** First local date, YYYY-MM-DD. */
  from: string
  /** Last local date, YYYY-MM-DD, inclusive. */
  to: string
}

// The searches run on suncalc's apparent altitude. Every threshold is below the horizon, where suncalc
// adds the constant SUNCALC_HORIZON_REFRACTION_DEG, so geometric h ≥ T exactly when apparent ≥ T + that
// constant, and both have the same crossing instants. Apparent altitude is a strictly increasing
// function of geometric altitude, so the highest and lowest points are the same instants too; only
// the reported extremes are converted back (convertApparentToGeometric).
const APPARENT_THRESHOLDS = THRESHOLDS.map(t => t + SUNCALC_HORIZON_REFRACTION_DEG)

function bandIndexOfApparent(apparent: number): number {
  let band = 0
  while (band < APPARENT_THRESHOLDS.length && apparent >= APPARENT_THRESHOLDS[band]!) band++
  return band
}

// Band index after a crossing: rising through threshold k enters band k + 1, setting through it band k.
function bandAfterCrossing(crossing: TraceCrossing): number {
  return crossing.rising ? crossing.level + 1 : crossing.level
}

// The site and threshold of the current search. Module state instead of closures keeps the hot loop
// free of allocations; the engine is synchronous, so no two traces interleave.
const SEARCH = { latitude: 0, longitude: 0, threshold: 0, lastMs: NaN, lastAzimuth: 0 }

function searchAltitude(ms: number): number {
  return sampleSunApparentAltitude(ms, SEARCH.latitude, SEARCH.longitude)
}

function searchNegatedAltitude(ms: number): number {
  return -sampleSunApparentAltitude(ms, SEARCH.latitude, SEARCH.longitude)
}

// Apparent altitude minus the current threshold, remembering the azimuth of the last evaluation.
function searchAboveThreshold(ms: number): number {
  const position = sampleSunPosition(ms, SEARCH.latitude, SEARCH.longitude)
  SEARCH.lastMs = ms
  SEARCH.lastAzimuth = position.azimuth
  return position.apparent - SEARCH.threshold
}

function sampleGrid(firstMs: number, count: number): Float64Array {
  const values = new Float64Array(count)
  for (let i = 0; i < count; i++) values[i] = searchAltitude(firstMs + i * GRID_STEP_MS)
  return values
}

// Day-to-day prediction. A crossing of a threshold, and the time of the highest or lowest point,
// moves smoothly from one day to the next: a quadratic extrapolation over the three days before is
// typically within a fraction of a second at mid latitudes. A prediction is only ever a starting
// point: it is confirmed by samples that bracket the root or the extremum, and when it fails the full
// search runs. Slots: crossings level * 2 + (rising ? 1 : 0); extrema 0 lows, 1 highs; newest first.
const CROSSING_HISTORY = new Float64Array(8 * 3)
const EXTREMUM_HISTORY = new Float64Array(2 * 3)

function predictSeries(history: Float64Array, slot: number): number {
  const c1 = history[slot * 3]!
  const c2 = history[slot * 3 + 1]!
  const c3 = history[slot * 3 + 2]!
  const d1 = c1 - c2
  const d2 = c2 - c3
  // Only extrapolate a steady daily series (no gap day, no polar transition in between).
  if (!(Math.abs(d1 - DAY_MS) < 2 * HOUR_MS && Math.abs(d1 - d2) < PREDICTION_MAX_WOBBLE_MS)) return NaN
  return c1 + d1 + (d1 - d2)
}

function recordSeries(history: Float64Array, slot: number, ms: number) {
  history[slot * 3 + 2] = history[slot * 3 + 1]!
  history[slot * 3 + 1] = history[slot * 3]!
  history[slot * 3] = ms
}

// Confirms a predicted extremum with three samples around it: if the middle one is the best, the
// extremum lies between the outer two (one extremum per grid bracket), and the parabola through the
// three places it to well under a second. Returns null when the prediction does not hold.
function confirmPredictedExtremum(f: (ms: number) => number, guess: number, lo: number, hi: number) {
  if (!(guess - EXTREMUM_PROBE_MS > lo && guess + EXTREMUM_PROBE_MS < hi)) return null
  const fm = f(guess)
  const fl = f(guess - EXTREMUM_PROBE_MS)
  if (fl < fm) return null
  const fr = f(guess + EXTREMUM_PROBE_MS)
  if (fr < fm) return null
  const curvature = fl - 2 * fm + fr
  const offset = curvature > 0 ? 0.5 * (fl - fr) / curvature : 0
  return { x: guess + offset * EXTREMUM_PROBE_MS, fx: fm - 0.25 * (fl - fr) * offset }
}

// Refines every local extreme of the samples near [fromMs, toMs] to the true highest or lowest point.
function refineExtrema(firstMs: number, values: Float64Array, fromMs: number, toMs: number): { ms: number, apparent: number, isMax: boolean }[] {
  const extrema: { ms: number, apparent: number, isMax: boolean }[] = []
  for (let i = 1; i < values.length - 1; i++) {
    const v = values[i]!
    const isMax = v > values[i - 1]! && v >= values[i + 1]!
    const isMin = v < values[i - 1]! && v <= values[i + 1]!
    const t = firstMs + i * GRID_STEP_MS
    if ((!isMax && !isMin) || t + GRID_STEP_MS <= fromMs || t - GRID_STEP_MS >= toMs) continue
    const sign = isMax ? -1 : 1
    const f = isMax ? searchNegatedAltitude : searchAltitude
    const slot = isMax ? 1 : 0
    const found = confirmPredictedExtremum(f, predictSeries(EXTREMUM_HISTORY, slot), t - GRID_STEP_MS, t + GRID_STEP_MS)
      ?? minimizeBrent(f, t - GRID_STEP_MS, t + GRID_STEP_MS, t, sign * v, EXTREMUM_TOLERANCE_MS, 60, sign * values[i - 1]!, sign * values[i + 1]!)
    recordSeries(EXTREMUM_HISTORY, slot, found.x)
    extrema.push({ ms: found.x, apparent: sign * found.fx, isMax })
  }
  return extrema.sort((a, b) => a.ms - b.ms)
}

// Grid samples and refined extrema merged in time order: between two neighbours the altitude is monotone.
function mergeSamples(firstMs: number, values: Float64Array, extrema: { ms: number, apparent: number }[]) {
  const size = values.length + extrema.length
  const times = new Float64Array(size)
  const alts = new Float64Array(size)
  let g = 0
  let x = 0
  for (let k = 0; k < size; k++) {
    const gridMs = firstMs + g * GRID_STEP_MS
    if (x < extrema.length && (g >= values.length || extrema[x]!.ms < gridMs)) {
      times[k] = extrema[x]!.ms
      alts[k] = extrema[x]!.apparent
      x++
    } else {
      times[k] = gridMs
      alts[k] = values[g]!
      g++
    }
  }
  return { times, alts }
}

// Finds the crossings of every threshold between two neighbouring samples (the altitude is monotone there).
function findCrossingsBetween(t0: number, a0: number, t1: number, a1: number, out: TraceCrossing[]) {
  const b0 = bandIndexOfApparent(a0)
  const b1 = bandIndexOfApparent(a1)
  if (b0 === b1) return
  const rising = b1 > b0
  let lo = t0
  let loAlt = a0
  for (let n = 0; n < Math.abs(b1 - b0); n++) {
    const level = rising ? b0 + n : b0 - 1 - n
    const slot = level * 2 + (rising ? 1 : 0)
    const threshold = APPARENT_THRESHOLDS[level]!
    SEARCH.threshold = threshold
    SEARCH.lastMs = NaN
    const guess = predictSeries(CROSSING_HISTORY, slot)
    const root = solveRootNearGuess(searchAboveThreshold, lo, t1, loAlt - threshold, a1 - threshold, guess, ROOT_TOLERANCE_MS / 2, ROOT_TOLERANCE_MS)
    // The last evaluation lies inside the final bracket (≤ 1 s away); re-sample only if none was taken.
    const azimuth = Math.abs(SEARCH.lastMs - root) <= ROOT_TOLERANCE_MS
      ? SEARCH.lastAzimuth
      : sampleSunPosition(root, SEARCH.latitude, SEARCH.longitude).azimuth
    recordSeries(CROSSING_HISTORY, slot, root)
    out.push({ ms: Math.round(root / 1000) * 1000, level, rising, azimuth })
    // The next threshold lies beyond this one: narrow its bracket (its sign is certain, its size close).
    lo = root
    loAlt = threshold
  }
}

/**
 * Samples and searches the sun over [fromMs, toMs]: every crossing and extremum inside it. The grid
 * runs two steps past each end so that an extremum near an end still shows among the samples.
 */
function traceSun(latitude: number, longitude: number, fromMs: number, toMs: number): SunTrace {
  SEARCH.latitude = latitude
  SEARCH.longitude = longitude
  CROSSING_HISTORY.fill(NaN)
  EXTREMUM_HISTORY.fill(NaN)
  const firstMs = Math.floor(fromMs / GRID_STEP_MS) * GRID_STEP_MS - 2 * GRID_STEP_MS
  const lastMs = Math.ceil(toMs / GRID_STEP_MS) * GRID_STEP_MS + 2 * GRID_STEP_MS
  const count = Math.round((lastMs - firstMs) / GRID_STEP_MS) + 1
  const values = sampleGrid(firstMs, count)
  const found = refineExtrema(firstMs, values, fromMs, toMs)
  const { times, alts } = mergeSamples(firstMs, values, found)
  const crossings: TraceCrossing[] = []
  for (let k = 1; k < times.length; k++) {
    // Only pieces that overlap the range: outside it the extrema were not refined.
    if (times[k]! <= fromMs || times[k - 1]! >= toMs) continue
    findCrossingsBetween(times[k - 1]!, alts[k - 1]!, times[k]!, alts[k]!, crossings)
  }
  const extrema = found.map(x => ({ ms: x.ms, altitude: convertApparentToGeometric(x.apparent), isMax: x.isMax }))
  return { startBand: bandIndexOfApparent(searchAltitude(fromMs)), crossings, extrema, times, alts }
}

// Appends a band from atMs to endMs. The last period always runs to endMs; a crossing at its very start
// (no time spent in it) replaces it, and same-kind neighbours are merged.
function appendBand(periods: LightPeriodMs[], kind: BandKind, atMs: number, endMs: number) {
  const last = periods[periods.length - 1]!
  if (last.kind === kind) return
  if (last.startMs < atMs) {
    last.endMs = atMs
    periods.push({ kind, startMs: atMs, endMs })
    return
  }
  const previous = periods[periods.length - 2]
  if (previous && previous.kind === kind) {
    periods.pop()
    previous.endMs = endMs
  } else {
    last.kind = kind
  }
}

/** The light bands covering the UTC instant range [startMs, endMs) at a place (no time zone needed). */
export function computeLightPeriodsInRange(latitude: number, longitude: number, startMs: number, endMs: number): LightPeriodMs[] {
  const lat = normalizeSunLatitude(latitude)
  const lon = normalizeSunLongitude(longitude)
  if (!Number.isFinite(startMs) || !Number.isFinite(endMs) || endMs < startMs) {
    throw new RangeError('endMs must be a finite instant at or after startMs')
  }
  if (endMs - startMs > MAX_LIGHT_RANGE_DAYS * DAY_MS) throw new RangeError(`range must be at most ${MAX_LIGHT_RANGE_DAYS} days`)
  if (endMs === startMs) return []
  const trace = traceSun(lat, lon, startMs, endMs)
  let band = trace.startBand
  let i = 0
  for (; i < trace.crossings.length && trace.crossings[i]!.ms <= startMs; i++) band = bandAfterCrossing(trace.crossings[i]!)
  const periods: LightPeriodMs[] = [{ kind: BAND_KINDS_ASCENDING[band]!, startMs, endMs }]
  for (; i < trace.crossings.length && trace.crossings[i]!.ms < endMs; i++) {
    const crossing = trace.crossings[i]!
    appendBand(periods, BAND_KINDS_ASCENDING[bandAfterCrossing(crossing)]!, crossing.ms, endMs)
  }
  return periods
}

// ---------------------------------------------------------------------------------------------
// Time zones. Offsets come from Intl (the IANA database bundled with Node). Intl is slow (~2 µs a
// call), so each zone's offset changes are found once per UTC month — one probe a day, then a bisection
// to the second where the offset differs — and cached; local midnights and ISO strings are then pure
// arithmetic. A zone that changed its offset twice within 24 h would be seen as one change or none;
// we know of no such case in the tz data for the years accepted here (1901–2149).

interface ZoneMonth {
  startOffsetMs: number
  /** Instants at which the offset changes, with the offset from then on. */
  changes: { ms: number, offsetMs: number }[]
}

interface ZoneTimeline {
  /** Segment i runs from starts[i] (−∞ for i = 0) to starts[i + 1] with offsets[i]. */
  starts: number[]
  offsets: number[]
}

const ZONE_FORMATTERS = new Map<string, Intl.DateTimeFormat>()
const VALID_ZONES = new Set<string>()
const ZONE_MONTHS = new Map<string, ZoneMonth>()
const MAX_CACHED_ZONE_MONTHS = 20_000
const ZONE_PROBE_DATE = new Date(0)
const WALL_CLOCK_RE = /^(\d+)\/(\d+)\/(\d+),? (\d+):(\d+):(\d+)$/

/** True for an IANA time zone name Intl knows (e.g. Europe/Oslo, UTC, Etc/GMT+2); false for offsets like +02:00. */
export function isValidTimeZone(tz: string): boolean {
  if (typeof tz !== 'string' || tz.length === 0 || tz.length > 64) return false
  if (VALID_ZONES.has(tz)) return true
  // Newer Intl versions accept bare offsets; those are not IANA zones and carry no daylight-saving rules.
  if (/^[+-]/.test(tz) || /\s/.test(tz)) return false
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz })
  } catch {
    return false
  }
  if (VALID_ZONES.size < 1_000) VALID_ZONES.add(tz)
  return true
}

function zoneFormatter(zone: string): Intl.DateTimeFormat {
  let formatter = ZONE_FORMATTERS.get(zone)
  if (!formatter) {
    if (!isValidTimeZone(zone)) throw new RangeError(`timezone must be an IANA time zone name, got "${zone}"`)
    formatter = new Intl.DateTimeFormat('en-US', {
      timeZone: zone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric',
      hour: 'numeric', minute: 'numeric', second: 'numeric'
    })
    ZONE_FORMATTERS.set(zone, formatter)
  }
  return formatter
}

function probeZoneOffsetMs(zone: string, ms: number): number {
  const whole = Math.floor(ms / 1000) * 1000
  ZONE_PROBE_DATE.setTime(whole)
  const match = WALL_CLOCK_RE.exec(zoneFormatter(zone).format(ZONE_PROBE_DATE))
  if (!match) throw new RangeError(`cannot read the wall clock of ${zone}`)
  const [, mo, d, y, h, mi, s] = match.map(Number) as number[]
  return Date.UTC(y!, mo! - 1, d!, h!, mi!, s!) - whole
}

// The second at which the offset switches from its value at lo to its value at hi (lo < hi).
function bisectZoneChange(zone: string, lo: number, hi: number, loOffset: number): number {
  while (hi - lo > 1000) {
    const mid = Math.floor((lo + hi) / 2000) * 1000
    if (mid <= lo) break
    if (probeZoneOffsetMs(zone, mid) === loOffset) lo = mid
    else hi = mid
  }
  return hi
}

// Offset changes of a zone within one UTC calendar month (months index from year 0), probed daily.
function loadZoneMonth(zone: string, monthIndex: number): ZoneMonth {
  const key = `${zone}|${monthIndex}`
  const cached = ZONE_MONTHS.get(key)
  if (cached) return cached
  const startMs = Date.UTC(Math.floor(monthIndex / 12), monthIndex % 12, 1)
  const endMs = Date.UTC(Math.floor(monthIndex / 12), monthIndex % 12 + 1, 1)
  const startOffsetMs = probeZoneOffsetMs(zone, startMs)
  const changes: ZoneMonth['changes'] = []
  let prevMs = startMs
  let prevOffset = startOffsetMs
  while (prevMs < endMs) {
    const ms = Math.min(prevMs + DAY_MS, endMs)
    const offset = probeZoneOffsetMs(zone, ms)
    if (offset !== prevOffset) changes.push({ ms: bisectZoneChange(zone, prevMs, ms, prevOffset), offsetMs: offset })
    prevMs = ms
    prevOffset = offset
  }
  if (ZONE_MONTHS.size >= MAX_CACHED_ZONE_MONTHS) ZONE_MONTHS.clear()
  const month = { startOffsetMs, changes }
  ZONE_MONTHS.set(key, month)
  return month
}

function monthIndexOf(ms: number): number {
  const date = new Date(ms)
  return date.getUTCFullYear() * 12 + date.getUTCMonth()
}

function buildZoneTimeline(zone: string, fromMs: number, toMs: number): ZoneTimeline {
  const first = monthIndexOf(fromMs)
  const last = monthIndexOf(toMs)
  const starts = [-Infinity]
  const offsets = [loadZoneMonth(zone, first).startOffsetMs]
  for (let m = first; m <= last; m++) {
    for (const change of loadZoneMonth(zone, m).changes) {
      if (change.offsetMs === offsets[offsets.length - 1]) continue
      starts.push(change.ms)
      offsets.push(change.offsetMs)
    }
  }
  return { starts, offsets }
}

function zoneOffsetAt(timeline: ZoneTimeline, ms: number): number {
  let i = timeline.starts.length - 1
  while (i > 0 && timeline.starts[i]! > ms) i--
  return timeline.offsets[i]!
}

// First instant at which the zone's wall clock shows at least wallMs (a local midnight written as UTC).
// In a spring-forward gap over midnight that is the change itself; when midnight happens twice, the first.
function findZoneWallInstant(timeline: ZoneTimeline, wallMs: number): number {
  let best = Infinity
  for (let i = 0; i < timeline.starts.length; i++) {
    const candidate = Math.max(timeline.starts[i]!, wallMs - timeline.offsets[i]!)
    const next = i + 1 < timeline.starts.length ? timeline.starts[i + 1]! : Infinity
    if (candidate < next && candidate < best) best = candidate
  }
  return best
}

const PAD2 = Array.from({ length: 100 }, (_, i) => String(i).padStart(2, '0'))

// Proleptic Gregorian date of a day count since 1970-01-01 (H. Hinnant, "chrono-compatible low-level date algorithms").
function civilFromDays(days: number): [number, number, number] {
  const z = days + 719468
  const era = Math.floor(z / 146097)
  const doe = z - era * 146097
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365)
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100))
  const mp = Math.floor((5 * doy + 2) / 153)
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1
  const m = mp < 10 ? mp + 3 : mp - 9
  return [yoe + era * 400 + (m <= 2 ? 1 : 0), m, d]
}

function formatUtcDate(wallMs: number): string {
  const [y, m, d] = civilFromDays(Math.floor(wallMs / DAY_MS))
  return `${y}-${PAD2[m]}-${PAD2[d]}`
}

const OFFSET_STRINGS = new Map<number, string>()

function formatOffset(offsetMs: number): string {
  let text = OFFSET_STRINGS.get(offsetMs)
  if (text === undefined) {
    const minutes = Math.round(offsetMs / MINUTE_MS)
    const abs = Math.abs(minutes)
    text = `${minutes < 0 ? '-' : '+'}${PAD2[Math.floor(abs / 60)]}:${PAD2[abs % 60]}`
    OFFSET_STRINGS.set(offsetMs, text)
  }
  return text
}

// The date part of the last formatted instant: most instants of a day share it.
const DATE_PREFIX = { days: NaN, text: '' }

function formatWithTimeline(timeline: ZoneTimeline, ms: number): string {
  const whole = Math.round(ms / 1000) * 1000
  const offsetMs = zoneOffsetAt(timeline, whole)
  const local = whole + offsetMs
  const days = Math.floor(local / DAY_MS)
  if (days !== DATE_PREFIX.days) {
    DATE_PREFIX.days = days
    DATE_PREFIX.text = formatUtcDate(local) + 'T'
  }
  const secs = Math.round((local - days * DAY_MS) / 1000)
  return DATE_PREFIX.text + PAD2[Math.floor(secs / 3600)] + ':' + PAD2[Math.floor(secs / 60) % 60] + ':' + PAD2[secs % 60] + formatOffset(offsetMs)
}

/** An instant as ISO 8601 with the zone's offset at that instant, to the second (e.g. 2026-12-01T09:12:34+01:00). */
export function formatInstantInZone(ms: number, zone: string): string {
  return formatWithTimeline(buildZoneTimeline(zone, ms - DAY_MS, ms + DAY_MS), ms)
}

/** Parses a YYYY-MM-DD local date to its midnight written as a UTC instant; throws naming the field. */
export function parseLocalDateToWallMs(value: string, field: string): number {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value)
  const wall = match ? Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])) : NaN
  if (!match || formatUtcDate(wall) !== value) throw new RangeError(`${field} must be a date as YYYY-MM-DD, got "${value}"`)
  const year = Number(match[1])
  // suncalc's ΔT fit and the position series are meant for roughly 1900–2150.
  if (year < 1901 || year > 2149) throw new RangeError(`${field} must be between 1901 and 2149`)
  return wall
}

/** Adds whole days to a YYYY-MM-DD local date. */
export function shiftLocalDate(date: string, days: number): string {
  return formatUtcDate(parseLocalDateToWallMs(date, 'date') + days * DAY_MS)
}

// ---------------------------------------------------------------------------------------------
// Cutting the trace into local days.

interface DayCursor {
  band: number
  crossing: number
  extremum: number
}

function roundTo(value: number, places: number): number {
  const f = 10 ** places
  return Math.round(value * f) / f
}

// A local midnight with the range its altitude must lie in (from the monotone samples around it),
// sampled exactly only when that range says it could be the day's highest or lowest point.
interface DayBoundary {
  ms: number
  low: number
  high: number
  exact: number
}

function describeBoundaries(trace: SunTrace, bounds: Float64Array): DayBoundary[] {
  const { times, alts } = trace
  const out: DayBoundary[] = []
  let k = 1
  for (const ms of bounds) {
    while (k < times.length - 1 && times[k]! < ms) k++
    const a = convertApparentToGeometric(alts[k - 1]!)
    const b = convertApparentToGeometric(alts[k]!)
    out.push({ ms, low: Math.min(a, b), high: Math.max(a, b), exact: NaN })
  }
  return out
}

function sampleBoundary(boundary: DayBoundary, latitude: number, longitude: number): number {
  if (Number.isNaN(boundary.exact)) boundary.exact = sampleSunAltitude(boundary.ms, latitude, longitude)
  return boundary.exact
}

// Highest and lowest altitude of a day: the refined extremes inside it, or one of its ends.
function summarizeAltitudes(trace: SunTrace, cursor: DayCursor, start: DayBoundary, end: DayBoundary, latitude: number, longitude: number) {
  let maxAlt = -Infinity
  let maxMs = start.ms
  let minAlt = Infinity
  while (cursor.extremum < trace.extrema.length && trace.extrema[cursor.extremum]!.ms < start.ms) cursor.extremum++
  for (let i = cursor.extremum; i < trace.extrema.length && trace.extrema[i]!.ms < end.ms; i++) {
    const x = trace.extrema[i]!
    if (x.altitude > maxAlt) {
      maxAlt = x.altitude
      maxMs = Math.round(x.ms / 1000) * 1000
    }
    if (x.altitude < minAlt) minAlt = x.altitude
  }
  for (const boundary of [start, end]) {
    if (boundary.high <= maxAlt && boundary.low >= minAlt) continue
    const h = sampleBoundary(boundary, latitude, longitude)
    if (h > maxAlt) {
      maxAlt = h
      // Still climbing at midnight (near the poles): the day's last second stands for its end.
      maxMs = boundary === end ? end.ms - 1000 : start.ms
    }
    minAlt = Math.min(minAlt, h)
  }
  return { maxAlt, maxMs, minAlt }
}

function classifyDay(periods: LightPeriodMs[]): { status: DayStatus, dayMs: number, civilMs: number } {
  let dayMs = 0
  let civilMs = 0
  for (const p of periods) {
    if (p.kind === 'day') dayMs += p.endMs - p.startMs
    if (p.kind === 'day' || p.kind === 'civil') civilMs += p.endMs - p.startMs
  }
  // A skipped date (no time at all) has no day in it, so it counts as polar night, never midnight sun.
  const status: DayStatus = dayMs === 0
    ? 'polar-night'
    : periods.length === 1 ? 'midnight-sun' : 'rises-and-sets'
  return { status, dayMs, civilMs }
}

function toSunEvent(crossing: TraceCrossing): SunEventMs {
  const azimuth = roundTo(crossing.azimuth, 1)
  return {
    type: crossing.rising ? RISING_EVENT_BY_THRESHOLD[crossing.level]! : SETTING_EVENT_BY_THRESHOLD[crossing.level]!,
    atMs: crossing.ms,
    azimuth: azimuth >= 360 ? 0 : azimuth
  }
}

// Periods and events of one local day [startMs, endMs); the cursor carries the band across days.
function cutDay(trace: SunTrace, cursor: DayCursor, startMs: number, endMs: number) {
  const events: SunEventMs[] = []
  const { crossings } = trace
  for (; cursor.crossing < crossings.length && crossings[cursor.crossing]!.ms <= startMs; cursor.crossing++) {
    const crossing = crossings[cursor.crossing]!
    cursor.band = bandAfterCrossing(crossing)
    if (crossing.ms === startMs) events.push(toSunEvent(crossing))
  }
  // A date the zone skipped altogether (Pacific/Apia, 2011-12-30) keeps one empty period, so that
  // every day still has a first start and a last end.
  const periods: LightPeriodMs[] = [{ kind: BAND_KINDS_ASCENDING[cursor.band]!, startMs, endMs }]
  for (; cursor.crossing < crossings.length && crossings[cursor.crossing]!.ms < endMs; cursor.crossing++) {
    const crossing = crossings[cursor.crossing]!
    cursor.band = bandAfterCrossing(crossing)
    events.push(toSunEvent(crossing))
    appendBand(periods, BAND_KINDS_ASCENDING[cursor.band]!, crossing.ms, endMs)
  }
  return { periods, events }
}

function validateDaysInput(input: LightDaysInput, maxDays: number) {
  const latitude = normalizeSunLatitude(input.latitude)
  const longitude = normalizeSunLongitude(input.longitude)
  if (!isValidTimeZone(input.timezone)) throw new RangeError(`timezone must be an IANA time zone name, got "${input.timezone}"`)
  const fromWall = parseLocalDateToWallMs(input.from, 'from')
  const toWall = parseLocalDateToWallMs(input.to, 'to')
  const dayCount = Math.round((toWall - fromWall) / DAY_MS) + 1
  if (dayCount < 1) throw new RangeError('to must be on or after from')
  if (dayCount > maxDays) throw new RangeError(`from–to must cover at most ${maxDays} days`)
  return { latitude, longitude, fromWall, dayCount }
}

function computeDaysWithTimeline(input: LightDaysInput, maxDays: number) {
  const { latitude, longitude, fromWall, dayCount } = validateDaysInput(input, maxDays)
  const timeline = buildZoneTimeline(input.timezone, fromWall - 2 * DAY_MS, fromWall + (dayCount + 2) * DAY_MS)
  const bounds = new Float64Array(dayCount + 1)
  for (let j = 0; j <= dayCount; j++) bounds[j] = findZoneWallInstant(timeline, fromWall + j * DAY_MS)
  const trace = traceSun(latitude, longitude, bounds[0]!, bounds[dayCount]!)
  const boundaries = describeBoundaries(trace, bounds)
  const cursor: DayCursor = { band: trace.startBand, crossing: 0, extremum: 0 }
  const days: LightDayMs[] = []
  for (let j = 0; j < dayCount; j++) {
    const startMs = bounds[j]!
    const endMs = bounds[j + 1]!
    const { periods, events } = cutDay(trace, cursor, startMs, endMs)
    const { maxAlt, maxMs, minAlt } = summarizeAltitudes(trace, cursor, boundaries[j]!, boundaries[j + 1]!, latitude, longitude)
    const { status, dayMs, civilMs } = classifyDay(periods)
    days.push({
      date: formatUtcDate(fromWall + j * DAY_MS), startMs, endMs, periods, events, solarNoonMs: maxMs,
      maxAltitude: roundTo(maxAlt, 2), minAltitude: roundTo(minAlt, 2),
      daylightMinutes: Math.round(dayMs / MINUTE_MS), civilLightMinutes: Math.round(civilMs / MINUTE_MS), status
    })
  }
  return { days, timeline }
}

/**
 * The light of each local day from..to (inclusive) as epoch milliseconds: periods partition each day
 * from local midnight to the next; events are the threshold crossings in time order.
 * `maxDays` (default 366) may be raised to 800 for season scans.
 */
export function computeLightDaysMs(input: LightDaysInput, options: { maxDays?: number } = {}): LightDayMs[] {
  return computeDaysWithTimeline(input, Math.min(options.maxDays ?? MAX_LIGHT_RANGE_DAYS, 800)).days
}

/**
 * The light of each local day from..to (inclusive, at most 366 days) with ISO 8601 instants in the
 * site zone's offset. Minutes are whole minutes (rounded); altitudes are geometric, to 0.01°.
 */
export function computeLightDays(input: LightDaysInput): LightDay[] {
  const { days, timeline } = computeDaysWithTimeline(input, MAX_LIGHT_RANGE_DAYS)
  return days.map(day => formatLightDay(day, timeline))
}

// One day with ISO strings; each boundary is formatted once and shared by the periods and events.
function formatLightDay(day: LightDayMs, timeline: ZoneTimeline): LightDay {
  const periods = new Array<LightDay['periods'][number]>(day.periods.length)
  let start = formatWithTimeline(timeline, day.startMs)
  for (let i = 0; i < day.periods.length; i++) {
    const p = day.periods[i]!
    const end = formatWithTimeline(timeline, p.endMs)
    periods[i] = { kind: p.kind, start, end }
    start = end
  }
  const events = day.events.map((e) => {
    const period = day.periods.find(p => p.startMs === e.atMs)
    const at = period ? periods[day.periods.indexOf(period)]!.start : formatWithTimeline(timeline, e.atMs)
    return { type: e.type, at, azimuth: e.azimuth }
  })
  return {
    date: day.date,
    periods,
    events,
    solarNoon: formatWithTimeline(timeline, day.solarNoonMs),
    maxAltitude: day.maxAltitude,
    minAltitude: day.minAltitude,
    daylightMinutes: day.daylightMinutes,
    civilLightMinutes: day.civilLightMinutes,
    status: day.status
  }
}

/** Drops the cached time-zone offset tables (for benchmarks that measure cold starts). */
export function clearTimeZoneCache() {
  ZONE_MONTHS.clear()
}
