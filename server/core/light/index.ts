// The light engine: splits the local days of a site into the bands of docs/light-model.md
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
  computeSuncalcRefractionDeg,
  convertApparentToGeometric,
  minimizeBrent,
  normalizeSunLatitude,
  normalizeSunLongitude,
  sampleSunAltitude,
  sampleSunApparentAltitude,
  sampleSunPosition,
  solveRootNearGuess
} from '../sun/position'
import { DiurnalCourse, sampleSunNodes } from '../sun/diurnal'
import {
  buildZoneTimeline,
  findZoneWallInstant,
  formatUtcDate,
  formatWithTimeline,
  isValidTimeZone,
  parseLocalDateToWallMs,
  type ZoneTimeline
} from '../time/zone-table'

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
  /** The same samples' geometric altitudes, when the trace has them (saves inverting the refraction). */
  geometric?: Float64Array
  /** Geometric altitude (degrees) at any instant of the range, when the trace has its own model of it. */
  altitudeAt?: (ms: number) => number
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

// Beyond this latitude the sun's altitude may not turn every day (within ~0.06° of a pole the
// declination's own change outruns the daily wobble): the sampled search handles those sites.
const COURSE_MAX_LATITUDE = 89.9
const SIN_THRESHOLDS = THRESHOLDS.map(t => Math.sin(t * Math.PI / 180))

/**
 * The sun over [fromMs, toMs] from its daily course (server/core/sun/diurnal.ts): every meridian
 * passage from a day before to a day after, the highest or lowest point near each, and each threshold
 * crossing on the monotone piece between two of them, seeded from the closed-form hour angle and
 * refined by Newton steps on the analytic rate. Null when the course does not turn daily (near a pole).
 */
function traceSunCourse(latitude: number, longitude: number, fromMs: number, toMs: number): SunTrace | null {
  if (Math.abs(latitude) > COURSE_MAX_LATITUDE) return null
  const spanFrom = fromMs - DAY_MS
  const spanTo = toMs + DAY_MS
  const course = new DiurnalCourse(sampleSunNodes(spanFrom - DAY_MS, spanTo + DAY_MS), latitude, longitude)
  course.at(spanFrom)
  let m = Math.ceil(course.hourAngle / Math.PI)
  let guess = spanFrom + (m * Math.PI - course.hourAngle) / (2 * Math.PI) * DAY_MS
  const found: { ms: number, g: number, isMax: boolean }[] = []
  for (;;) {
    // the first passage is found on the hour angle; later ones start from the last extreme + half a day
    const passage = found.length ? guess : course.findHourAngle(guess, m * Math.PI)
    if (passage > spanTo) break
    const isMax = ((m % 2) + 2) % 2 === 0
    const extremum = course.findExtremum(passage, isMax)
    if (!extremum) return null
    const last = found[found.length - 1]
    // each extreme must follow the last and lie beyond it in altitude, or the course is not simple here
    if (last && (extremum.ms <= last.ms || (isMax ? extremum.g <= last.g : extremum.g >= last.g))) return null
    found.push({ ms: extremum.ms, g: extremum.g, isMax })
    m++
    // the next extreme is of the kind two back: a day after it, corrected by that kind's own drift
    // (within a second or two, so Newton usually settles it on its first evaluation)
    const n = found.length
    guess = n >= 4 ? 2 * found[n - 2]!.ms - found[n - 4]!.ms : extremum.ms + DAY_MS / 2
  }
  if (found.length < 2) return null
  const times = new Float64Array(found.length)
  const alts = new Float64Array(found.length)
  const geometric = new Float64Array(found.length)
  const extrema: TraceExtremum[] = []
  found.forEach((x, k) => {
    const altitude = Math.asin(Math.max(-1, Math.min(1, x.g))) * 180 / Math.PI
    times[k] = x.ms
    geometric[k] = altitude
    alts[k] = altitude + computeSuncalcRefractionDeg(altitude)
    extrema.push({ ms: x.ms, altitude, isMax: x.isMax })
  })
  const crossings: TraceCrossing[] = []
  for (let k = 1; k < found.length; k++) {
    const a = found[k - 1]!
    const b = found[k]!
    const rising = b.isMax
    const max = rising ? b : a
    const mid = 0.5 * (a.g + b.g)
    const half = 0.5 * Math.abs(b.g - a.g)
    for (let n = 0; n < SIN_THRESHOLDS.length; n++) {
      const level = rising ? n : SIN_THRESHOLDS.length - 1 - n
      const target = SIN_THRESHOLDS[level]!
      if (!(target > Math.min(a.g, b.g) && target < Math.max(a.g, b.g))) continue
      // closed-form hour angle from the highest point (cos H0 = (sin h0 − sin φ sin δ) / (cos φ cos δ)),
      // as a share of the half-day between the two extremes
      const share = Math.acos(Math.max(-1, Math.min(1, (target - mid) / half))) / Math.PI
      const seed = max.ms + (rising ? -1 : 1) * share * (b.ms - a.ms)
      // the course's last evaluation is within 20 ms of the root: its azimuth is the crossing's (±0.0002°)
      const root = course.findCrossing(a.ms, b.ms, a.g, b.g, target, seed)
      crossings.push({ ms: Math.round(root / 1000) * 1000, level, rising, azimuth: course.azimuthDeg() })
    }
  }
  const startAltitude = course.altitudeDeg(fromMs)
  return { startBand: bandIndexOfApparent(startAltitude + computeSuncalcRefractionDeg(startAltitude)), crossings, extrema, times, alts, geometric, altitudeAt: ms => course.altitudeDeg(ms) }
}

/**
 * Samples and searches the sun over [fromMs, toMs]: every crossing and extremum inside it. From the
 * daily course where it turns daily (nearly everywhere); else on a grid that runs two steps past each
 * end so that an extremum near an end still shows among the samples.
 */
function traceSun(latitude: number, longitude: number, fromMs: number, toMs: number): SunTrace {
  const fast = traceSunCourse(latitude, longitude, fromMs, toMs)
  if (fast) return fast
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
  const { times, alts, geometric } = trace
  const out: DayBoundary[] = []
  let k = 1
  for (const ms of bounds) {
    while (k < times.length - 1 && times[k]! < ms) k++
    const a = geometric ? geometric[k - 1]! : convertApparentToGeometric(alts[k - 1]!)
    const b = geometric ? geometric[k]! : convertApparentToGeometric(alts[k]!)
    out.push({ ms, low: Math.min(a, b), high: Math.max(a, b), exact: NaN })
  }
  return out
}

function sampleBoundary(trace: SunTrace, boundary: DayBoundary, latitude: number, longitude: number): number {
  if (Number.isNaN(boundary.exact)) boundary.exact = trace.altitudeAt ? trace.altitudeAt(boundary.ms) : sampleSunAltitude(boundary.ms, latitude, longitude)
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
    const h = sampleBoundary(trace, boundary, latitude, longitude)
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
  // each day starts where the one before ended: its first instant is formatted once for both
  const shared = { ms: NaN, text: '' }
  return days.map(day => formatLightDay(day, timeline, shared))
}

// One day with ISO strings; each boundary is formatted once and shared by the periods and events.
// Instants are formatted in time order (the formatter keeps the last date's text while the date holds).
function formatLightDay(day: LightDayMs, timeline: ZoneTimeline, shared: { ms: number, text: string }): LightDay {
  const periods = new Array<LightDay['periods'][number]>(day.periods.length)
  let start = shared.ms === day.startMs ? shared.text : formatWithTimeline(timeline, day.startMs)
  const solarNoon = formatWithTimeline(timeline, day.solarNoonMs)
  for (let i = 0; i < day.periods.length; i++) {
    const p = day.periods[i]!
    const end = formatWithTimeline(timeline, p.endMs)
    periods[i] = { kind: p.kind, start, end }
    start = end
  }
  shared.ms = day.periods[day.periods.length - 1]!.endMs
  shared.text = start
  const events = day.events.map((e) => {
    const period = day.periods.find(p => p.startMs === e.atMs)
    const at = period ? periods[day.periods.indexOf(period)]!.start : formatWithTimeline(timeline, e.atMs)
    return { type: e.type, at, azimuth: e.azimuth }
  })
  return {
    date: day.date,
    periods,
    events,
    solarNoon,
    maxAltitude: day.maxAltitude,
    minAltitude: day.minAltitude,
    daylightMinutes: day.daylightMinutes,
    civilLightMinutes: day.civilLightMinutes,
    status: day.status
  }
}
