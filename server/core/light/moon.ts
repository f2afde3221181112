// The moon as a light layer (docs/api.md, "Light"): for each local day of a site, when the moon is up,
// its rises and sets, its lit fraction at the middle of the day and its highest altitude.
// suncalc's moon position is topocentric (it applies the moon's parallax) and adds the same
// refraction model as for the sun; that refraction is undone exactly (../sun/position.ts), so "up"
// means the geometric altitude of the moon's centre is at or above −0.833°, the sun's rise and set
// altitude, on the same footing as the sun's bands. Pure TypeScript: no framework imports.
import { getMoonIllumination, getMoonPosition } from 'suncalc'
import { convertApparentToGeometric, minimizeBrent, normalizeSunLatitude, normalizeSunLongitude, solveRootBrent } from '../sun/position'
import { formatZonedIso, localMidnightMs } from '../time/zoned'

/** Geometric altitude (degrees) of the moon's centre at rise and set, as for the sun. */
export const MOON_HORIZON_DEG = -0.833

const MINUTE_MS = 60_000
// The moon's altitude has one highest and one lowest point per ~24.8 h, hours apart; an hourly grid
// shows each of them as a local extreme of the samples. Crossings are searched only on the monotone
// pieces between those extremes, so a shallow dip past the horizon between two samples is still found.
const GRID_STEP_MS = 60 * MINUTE_MS
const ROOT_TOLERANCE_MS = 1_000
const EXTREMUM_TOLERANCE_MS = 30_000
// Over the hour either side of a sampled extreme the true extreme can lie at most ~3.1° beyond it
// (altitude's second derivative ≤ 90° × (15°/h in radians)² ≈ 6.2°/h², times (1 h)² / 2). Extremes
// nearer the horizon than this are refined exactly (a crossing may hide there); the others only need
// the day's highest altitude, which a parabola through the three samples gives to ~0.01°.
const REFINE_MARGIN_DEG = 4
// Local dates allowed in one call (a year and a bit, as the light routes).
const MAX_MOON_DAYS = 800

export interface MoonSpanMs { startMs: number, endMs: number }
export interface MoonEventMs { type: 'moonrise' | 'moonset', atMs: number, azimuth: number }
export interface MoonDayMs {
  date: string
  up: MoonSpanMs[]
  events: MoonEventMs[]
  /** Lit fraction (0–1) at the middle of the local day. */
  illumination: number
  /** Highest geometric altitude of the moon's centre during the local day, degrees to 0.01. */
  maxAltitude: number
}

/** One local day's moon in the API shape: ISO instants with the site zone's offset. */
export interface MoonDay {
  up: { start: string, end: string }[]
  events: { type: 'moonrise' | 'moonset', at: string, azimuth: number }[]
  illumination: number
  maxAltitude: number
}

export interface MoonDaysInput {
  latitude: number
  longitude: number
  timezone: string
  /** First and last local date (YYYY-MM-DD), inclusive. */
  from: string
  to: string
}

const SCRATCH_DATE = new Date(0)

/** Geometric topocentric altitude (degrees) of the moon's centre at an instant, from suncalc. */
export function sampleMoonAltitude(ms: number, latitude: number, longitude: number): number {
  SCRATCH_DATE.setTime(ms)
  return convertApparentToGeometric(getMoonPosition(SCRATCH_DATE, latitude, longitude).altitude)
}

function sampleMoonAzimuth(ms: number, latitude: number, longitude: number): number {
  SCRATCH_DATE.setTime(ms)
  const azimuth = Math.round(getMoonPosition(SCRATCH_DATE, latitude, longitude).azimuth * 10) / 10
  return azimuth >= 360 ? 0 : azimuth < 0 ? azimuth + 360 : azimuth
}

/** The moon's lit fraction (0–1) at an instant, from suncalc. */
export function sampleMoonIllumination(ms: number): number {
  return getMoonIllumination(new Date(ms)).fraction
}

function addDate(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

function roundTo(value: number, digits: number): number {
  const f = 10 ** digits
  return Math.round(value * f) / f
}

// Brent's minimisation near the horizon, else the vertex of the parabola through the three samples.
function locateExtremum(alt: (ms: number) => number, t0: number, t1: number, t2: number, a0: number, a1: number, a2: number): { x: number, alt: number } {
  if (Math.abs(a1 - MOON_HORIZON_DEG) < REFINE_MARGIN_DEG) {
    const sign = a1 >= a0 ? -1 : 1
    const best = minimizeBrent(ms => sign * alt(ms), t0, t2, t1, sign * a1, EXTREMUM_TOLERANCE_MS, 60, sign * a0, sign * a2)
    return { x: best.x, alt: sign * best.fx }
  }
  const h = t1 - t0
  const curvature = a0 - 2 * a1 + a2
  if (curvature === 0) return { x: t1, alt: a1 }
  const offset = (h * (a0 - a2)) / (2 * curvature)
  return { x: t1 + offset, alt: a1 - ((a0 - a2) * (a0 - a2)) / (8 * curvature) }
}

interface MoonTrace {
  /** Sample instants and altitudes in time order, with every refined extremum: monotone between neighbours. */
  times: number[]
  alts: number[]
  crossings: { ms: number, rising: boolean }[]
}

// Samples the altitude on a grid one step beyond both ends, inserts each refined extremum, then finds
// every crossing of the horizon altitude on the monotone pieces between neighbouring points.
function traceMoon(latitude: number, longitude: number, fromMs: number, toMs: number): MoonTrace {
  const alt = (ms: number) => sampleMoonAltitude(ms, latitude, longitude)
  const grid: number[] = []
  for (let t = fromMs - GRID_STEP_MS; t < toMs + GRID_STEP_MS; t += GRID_STEP_MS) grid.push(t)
  grid.push(toMs + GRID_STEP_MS)
  const gridAlts = grid.map(alt)
  const times: number[] = [grid[0]!]
  const alts: number[] = [gridAlts[0]!]
  for (let i = 1; i < grid.length; i++) {
    const prev = gridAlts[i - 1]!
    const here = gridAlts[i]!
    const next = gridAlts[i + 1]
    if (next !== undefined && ((here >= prev && here >= next) || (here <= prev && here <= next))) {
      // a highest (or lowest) sample: the true extremum between its neighbours
      const best = locateExtremum(alt, grid[i - 1]!, grid[i]!, grid[i + 1]!, prev, here, next)
      const [a, b] = best.x < grid[i]! ? [[best.x, best.alt], [grid[i]!, here]] : [[grid[i]!, here], [best.x, best.alt]]
      times.push(a[0]!, b[0]!)
      alts.push(a[1]!, b[1]!)
    } else {
      times.push(grid[i]!)
      alts.push(here)
    }
  }
  const crossings: MoonTrace['crossings'] = []
  const above = (ms: number) => alt(ms) - MOON_HORIZON_DEG
  for (let i = 1; i < times.length; i++) {
    const fa = alts[i - 1]! - MOON_HORIZON_DEG
    const fb = alts[i]! - MOON_HORIZON_DEG
    if ((fa >= 0) === (fb >= 0) || times[i]! <= times[i - 1]!) continue
    const root = solveRootBrent(above, times[i - 1]!, times[i]!, fa, fb, ROOT_TOLERANCE_MS)
    crossings.push({ ms: Math.round(root / 1000) * 1000, rising: fb >= 0 })
  }
  return { times, alts, crossings }
}

// The up spans of [startMs, endMs): the state at the start, then flipped at each crossing inside.
function cutSpans(trace: MoonTrace, startMs: number, endMs: number, upAtStart: boolean): MoonSpanMs[] {
  const spans: MoonSpanMs[] = []
  let openedAt = upAtStart ? startMs : NaN
  for (const c of trace.crossings) {
    if (c.ms <= startMs || c.ms >= endMs) continue
    if (c.rising && Number.isNaN(openedAt)) openedAt = c.ms
    if (!c.rising && !Number.isNaN(openedAt)) {
      if (c.ms > openedAt) spans.push({ startMs: openedAt, endMs: c.ms })
      openedAt = NaN
    }
  }
  if (!Number.isNaN(openedAt) && endMs > openedAt) spans.push({ startMs: openedAt, endMs })
  return spans
}

function highestInDay(trace: MoonTrace, startMs: number, endMs: number, edgeAlts: [number, number]): number {
  let best = Math.max(edgeAlts[0], edgeAlts[1])
  for (let i = 0; i < trace.times.length; i++) {
    const t = trace.times[i]!
    if (t > startMs && t < endMs && trace.alts[i]! > best) best = trace.alts[i]!
  }
  return best
}

/** The moon over each local date from..to (inclusive) at a site, as epoch milliseconds; spans cut at local midnight. */
export function computeMoonDaysMs(input: MoonDaysInput): MoonDayMs[] {
  const latitude = normalizeSunLatitude(input.latitude)
  const longitude = normalizeSunLongitude(input.longitude)
  const dates: string[] = []
  for (let d = input.from; d <= input.to; d = addDate(d, 1)) {
    dates.push(d)
    if (dates.length > MAX_MOON_DAYS) throw new RangeError(`the range may span at most ${MAX_MOON_DAYS} days`)
  }
  if (!dates.length) return []
  const bounds = [...dates, addDate(input.to, 1)].map(d => localMidnightMs(d, input.timezone))
  const trace = traceMoon(latitude, longitude, bounds[0]!, bounds[dates.length]!)
  const edgeAlts = bounds.map(ms => sampleMoonAltitude(ms, latitude, longitude))
  return dates.map((date, j) => {
    const startMs = bounds[j]!
    const endMs = bounds[j + 1]!
    const events = trace.crossings.filter(c => c.ms >= startMs && c.ms < endMs).map(c => ({
      type: c.rising ? 'moonrise' as const : 'moonset' as const,
      atMs: c.ms,
      azimuth: sampleMoonAzimuth(c.ms, latitude, longitude)
    }))
    return {
      date,
      up: cutSpans(trace, startMs, endMs, edgeAlts[j]! >= MOON_HORIZON_DEG),
      events,
      illumination: roundTo(sampleMoonIllumination((startMs + endMs) / 2), 3),
      maxAltitude: roundTo(highestInDay(trace, startMs, endMs, [edgeAlts[j]!, edgeAlts[j + 1]!]), 2)
    }
  })
}

/** The moon over each local date from..to with ISO 8601 instants in the site zone's offset. */
export function computeMoonDays(input: MoonDaysInput): (MoonDay & { date: string })[] {
  const iso = (ms: number) => formatZonedIso(ms, input.timezone)
  return computeMoonDaysMs(input).map(day => ({
    date: day.date,
    up: day.up.map(s => ({ start: iso(s.startMs), end: iso(s.endMs) })),
    events: day.events.map(e => ({ type: e.type, at: iso(e.atMs), azimuth: e.azimuth })),
    illumination: day.illumination,
    maxAltitude: day.maxAltitude
  }))
}

/** Adds each day's `moon` to light days of the same site and dates (matched by date). */
export function attachMoonToDays<T extends { date: string }>(days: T[], input: Omit<MoonDaysInput, 'from' | 'to'>): (T & { moon: MoonDay })[] {
  if (!days.length) return []
  const moons = new Map(computeMoonDays({ ...input, from: days[0]!.date, to: days[days.length - 1]!.date }).map(({ date, ...moon }) => [date, moon]))
  return days.map(day => ({ ...day, moon: moons.get(day.date)! }))
}

/** The moon of one local day as the crew screens show it: spans for the strip, and a line of words. */
export interface MoonDaySummary {
  /** Up spans cut at the day's midnights, ISO in the site's zone (drawn on the day strip). */
  up: { start: string, end: string }[]
  illumination: number
  maxAltitude: number
  /** `Moon up 14:10–02:30, 92 % lit`, with times in the display zone. */
  words: string
  /** Minutes the moon is up within the local day. */
  upMinutes: number
}

interface MoonWordsInput extends MoonDaysInput {
  /** Zone the times in the words are written in (the site's or the person's choice). */
  zone: string
  formatTime: (ms: number, zone: string) => string
}

// Spans joined across midnight, so a moon up 14:10–02:30 reads as one span rather than two.
function joinSpans(days: MoonDayMs[]): MoonSpanMs[] {
  const out: MoonSpanMs[] = []
  for (const span of days.flatMap(d => d.up)) {
    const last = out[out.length - 1]
    if (last && last.endMs === span.startMs) last.endMs = span.endMs
    else out.push({ ...span })
  }
  return out
}

function describeSpan(span: MoonSpanMs, dayStart: number, dayEnd: number, zone: string, time: MoonWordsInput['formatTime']): string {
  const starts = span.startMs > dayStart
  const ends = span.endMs < dayEnd + 86_400_000
  if (!starts && span.endMs >= dayEnd) return 'all day'
  if (!starts) return `until ${time(span.endMs, zone)}`
  if (!ends) return `from ${time(span.startMs, zone)}, and all the next day`
  return `${time(span.startMs, zone)}–${time(span.endMs, zone)}`
}

/** The moon of each local date from..to in words and spans, for the crew's home screen and briefing. */
export function summariseMoonDays(input: MoonWordsInput): (MoonDaySummary & { date: string })[] {
  const wide = computeMoonDaysMs({ ...input, from: addDate(input.from, -1), to: addDate(input.to, 2) })
  const joined = joinSpans(wide)
  const iso = (ms: number) => formatZonedIso(ms, input.timezone)
  return wide.slice(1, -2).map((day) => {
    const dayStart = localMidnightMs(day.date, input.timezone)
    const dayEnd = localMidnightMs(addDate(day.date, 1), input.timezone)
    const lit = `${Math.round(day.illumination * 100)} % lit`
    const parts = joined.filter(s => s.endMs > dayStart && s.startMs < dayEnd).map(s => describeSpan(s, dayStart, dayEnd, input.zone, input.formatTime))
    const words = parts.length ? `Moon up ${parts.join(' and ')}, ${lit}` : `Moon below the horizon all day, ${lit}`
    return {
      date: day.date,
      up: day.up.map(s => ({ start: iso(s.startMs), end: iso(s.endMs) })),
      illumination: day.illumination,
      maxAltitude: day.maxAltitude,
      words,
      upMinutes: Math.round(day.up.reduce((sum, s) => sum + s.endMs - s.startMs, 0) / 60_000)
    }
  })
}
