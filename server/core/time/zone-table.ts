// The one time-zone module: every conversion between instants and wall clocks on the server goes
// through the offset tables kept here. Offsets come from Intl (the IANA tz database bundled with
// Node). Intl is slow (~2 µs a call), so each zone's offset changes are found once per UTC month —
// one probe a day, then a bisection to the second where the offset differs — and cached; local
// midnights, wall clocks and ISO strings are then pure arithmetic. A zone that changed its offset
// twice within 24 h would be seen as one change or none; we know of no such case in the tz data for
// the years accepted here (1901–2149).
//
// One rule for clock changes (docs/light-model.md, "Local time"): a wall-clock time inside a
// spring-forward gap moves forward by the length of the gap (02:30 in a 02:00→03:00 gap is 03:30;
// 02:10 in Lord Howe's 02:00→02:30 gap is 02:40); a wall-clock time that happens twice (an autumn
// overlap of any length: 30 min, 1 h, 2 h) is the earlier of its instants, and the reading says so.
// A local day starts at the first instant that shows its date. Pure: no framework imports.
import { isValidTimeZone } from '../../../shared/time-zone'

export { isValidTimeZone }

const MINUTE_MS = 60_000
const DAY_MS = 86_400_000

interface ZoneMonth {
  startOffsetMs: number
  /** Instants at which the offset changes, with the offset from then on. */
  changes: { ms: number, offsetMs: number }[]
}

/** A zone's offsets over a stretch of time. Segment i runs from starts[i] (−∞ for i = 0) to starts[i + 1] with offsets[i]. */
export interface ZoneTimeline {
  starts: number[]
  offsets: number[]
}

const ZONE_FORMATTERS = new Map<string, Intl.DateTimeFormat>()
const ZONE_MONTHS = new Map<string, ZoneMonth>()
const MAX_CACHED_ZONE_MONTHS = 20_000
const ZONE_PROBE_DATE = new Date(0)
const WALL_CLOCK_RE = /^(\d+)\/(\d+)\/(\d+),? (\d+):(\d+):(\d+)$/

// Date.UTC reads years 0–99 as 1900–1999; this does not.
function utcMs(year: number, month: number, day: number, hour = 0, minute = 0, second = 0): number {
  const date = new Date(0)
  date.setUTCFullYear(year, month, day)
  date.setUTCHours(hour, minute, second, 0)
  return date.getTime()
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
  return utcMs(y!, mo! - 1, d!, h!, mi!, s!) - whole
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
  const startMs = utcMs(Math.floor(monthIndex / 12), monthIndex % 12, 1)
  const endMs = utcMs(Math.floor(monthIndex / 12), monthIndex % 12 + 1, 1)
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

/** The zone's offsets from fromMs to toMs (UTC instants), from the cached month tables. */
export function buildZoneTimeline(zone: string, fromMs: number, toMs: number): ZoneTimeline {
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

/** The offset (ms, east positive) in force at an instant of the timeline. */
export function zoneOffsetAt(timeline: ZoneTimeline, ms: number): number {
  let i = timeline.starts.length - 1
  while (i > 0 && timeline.starts[i]! > ms) i--
  return timeline.offsets[i]!
}

/**
 * First instant at which the zone's wall clock shows at least wallMs (a local midnight written as
 * UTC): the start of a local day. In a spring-forward gap over midnight that is the change itself;
 * when midnight happens twice, the first.
 */
export function findZoneWallInstant(timeline: ZoneTimeline, wallMs: number): number {
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

/** The YYYY-MM-DD date of a wall clock written as a UTC instant. */
export function formatUtcDate(wallMs: number): string {
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

/** An instant (rounded to the second) as ISO 8601 with the timeline's offset, e.g. 2026-12-01T09:12:34+01:00. */
export function formatWithTimeline(timeline: ZoneTimeline, ms: number): string {
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

function timelineAround(zone: string, ms: number): ZoneTimeline {
  return buildZoneTimeline(zone, ms - DAY_MS, ms + DAY_MS)
}

/** An instant as ISO 8601 with the zone's offset at that instant, rounded to the second (e.g. 2026-12-01T09:12:34+01:00). */
export function formatInstantInZone(ms: number, zone: string): string {
  return formatWithTimeline(timelineAround(zone, ms), ms)
}

/** The zone's offset from UTC at an instant, in ms (east positive). */
export function zoneOffsetMs(ms: number, zone: string): number {
  return zoneOffsetAt(timelineAround(zone, ms), ms)
}

/** The zone's offset from UTC at an instant, in whole minutes (east positive). */
export function zoneOffsetMinutes(ms: number, zone: string): number {
  return Math.round(zoneOffsetMs(Math.floor(ms / 1000) * 1000, zone) / MINUTE_MS)
}

/** The wall clock of an instant in a zone as `YYYY-MM-DDTHH:mm:ss` (seconds truncated, no offset). */
export function wallClockOf(ms: number, zone: string): string {
  return formatInstantInZone(Math.floor(ms / 1000) * 1000, zone).slice(0, 19)
}

/** The local date `YYYY-MM-DD` of an instant in a zone. */
export function localDateOf(ms: number, zone: string): string {
  return wallClockOf(ms, zone).slice(0, 10)
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

/** The first instant of a local date in a zone (its midnight, or the change itself when midnight is skipped). */
export function localMidnightMs(date: string, zone: string): number {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date)
  if (!match) throw new RangeError(`date must be a date as YYYY-MM-DD, got "${date}"`)
  const wallMs = utcMs(Number(match[1]), Number(match[2]) - 1, Number(match[3]))
  return findZoneWallInstant(buildZoneTimeline(zone, wallMs - 2 * DAY_MS, wallMs + 2 * DAY_MS), wallMs)
}

const WALL_TIME_RE = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/

/** A wall-clock time that names one instant. */
export interface WallClockOnce { kind: 'once', ms: number }
/** A wall-clock time in a spring-forward gap: `ms` reads it with the offset in force before the gap, so it shows `gapMs` later. */
export interface WallClockGap { kind: 'gap', ms: number, gapMs: number }
/** A wall-clock time that happens twice: `ms` is the earlier instant, `laterMs` the other, `overlapMs` after it. */
export interface WallClockOverlap { kind: 'overlap', ms: number, laterMs: number, overlapMs: number }
/** How a wall-clock time reads in a zone: once, not at all (a gap), or twice (an overlap). */
export type WallClockReading = WallClockOnce | WallClockGap | WallClockOverlap

/**
 * The instant of a wall-clock time `YYYY-MM-DDTHH:mm[:ss]` in a zone, by the one rule of this module:
 * in a spring-forward gap the time moves forward by the gap; in an overlap of any length the earlier
 * instant is taken. Throws a RangeError for text that is not such a time or a zone that is unknown.
 */
export function resolveWallClock(wall: string, zone: string): WallClockReading {
  const match = WALL_TIME_RE.exec(wall)
  const wallMs = match ? utcMs(Number(match[1]), Number(match[2]) - 1, Number(match[3]), Number(match[4]), Number(match[5]), Number(match[6] ?? 0)) : NaN
  if (!match || Number.isNaN(wallMs) || new Date(wallMs).toISOString().slice(0, 19) !== `${wall.slice(0, 16)}:${match[6] ?? '00'}`) {
    throw new RangeError(`expected a wall-clock time as YYYY-MM-DDTHH:mm, got "${wall}"`)
  }
  // No zone is more than 26 h from UTC: two days either side hold every instant that could show wallMs.
  const timeline = buildZoneTimeline(zone, wallMs - 2 * DAY_MS, wallMs + 2 * DAY_MS)
  const { starts, offsets } = timeline
  const found: number[] = []
  for (let i = 0; i < starts.length; i++) {
    const ms = wallMs - offsets[i]!
    const next = i + 1 < starts.length ? starts[i + 1]! : Infinity
    if (ms >= starts[i]! && ms < next) found.push(ms)
  }
  found.sort((a, b) => a - b)
  if (found.length === 1) return { kind: 'once', ms: found[0]! }
  if (found.length > 1) return { kind: 'overlap', ms: found[0]!, laterMs: found[found.length - 1]!, overlapMs: found[found.length - 1]! - found[0]! }
  // In a gap: the change it falls in is the one where the old offset reads past it and the new one before it.
  for (let i = 1; i < starts.length; i++) {
    const before = wallMs - offsets[i - 1]!
    if (before >= starts[i]! && wallMs - offsets[i]! < starts[i]!) return { kind: 'gap', ms: before, gapMs: offsets[i]! - offsets[i - 1]! }
  }
  return { kind: 'once', ms: wallMs - zoneOffsetAt(timeline, wallMs) }
}

/** Drops the cached time-zone offset tables (for benchmarks that measure cold starts). */
export function clearTimeZoneCache() {
  ZONE_MONTHS.clear()
}
