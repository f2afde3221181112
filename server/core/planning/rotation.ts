// A rotation's cycle expanded into shifts on the site's wall clock (docs/api.md, "Rotations"): on days
// then off days from `from` to `to`, one shift per working day from startTime to endTime. Wall-clock
// times hold across clock changes, so the shift is an hour shorter or longer on the night the
// clocks change; a time in a skipped hour moves to the first minute after the gap; a time in a
// repeated hour takes its first occurrence. Pure TypeScript: no framework, database or network.
import { addDays } from '../../../shared/format'
import { formatZonedIso } from '../time/zoned'

export const MAX_ROTATION_DAYS = 366
export const MAX_CYCLE_DAYS = 366
const MINUTE_MS = 60_000
const DAY_MS = 86_400_000
const TIME_RE = /^([01]\d|2[0-3]):([0-5]\d)$/
const DATE_RE = /^\d{4}-\d{2}-\d{2}$/

export interface RotationCycle {
  /** First local date of the rotation, YYYY-MM-DD. */
  from: string
  /** Last local date of the rotation, inclusive. */
  to: string
  /** Wall-clock start and end, HH:mm; an end at or before the start ends the next day. */
  startTime: string
  endTime: string
  onDays: number
  offDays: number
}

export interface RotationIssue {
  field: keyof RotationCycle
  message: string
}

export interface PlannedShift {
  /** The local date the shift starts on. */
  date: string
  /** Which working day of the rotation this is, from 0. */
  index: number
  startMs: number
  endMs: number
  /** Set when a wall-clock time fell in a clock-change gap or overlap. */
  timeNotes: string[]
}

function dateNumber(date: string): number {
  return Date.parse(`${date}T00:00:00Z`) / DAY_MS
}

/** Days from `from` to `to`, both included (0 or less when `to` is before `from`). */
export function countRotationDays(from: string, to: string): number {
  return dateNumber(to) - dateNumber(from) + 1
}

function isRealDate(value: string): boolean {
  return DATE_RE.test(value) && !Number.isNaN(Date.parse(`${value}T00:00:00Z`))
    && new Date(`${value}T00:00:00Z`).toISOString().slice(0, 10) === value
}

/** Everything wrong with a cycle, each naming its field; empty when it can be expanded. */
export function findRotationIssues(cycle: RotationCycle): RotationIssue[] {
  const issues: RotationIssue[] = []
  if (!isRealDate(cycle.from)) issues.push({ field: 'from', message: 'expected a date as YYYY-MM-DD' })
  if (!isRealDate(cycle.to)) issues.push({ field: 'to', message: 'expected a date as YYYY-MM-DD' })
  if (!TIME_RE.test(cycle.startTime)) issues.push({ field: 'startTime', message: 'expected a time of day as HH:mm, 00:00 to 23:59' })
  if (!TIME_RE.test(cycle.endTime)) issues.push({ field: 'endTime', message: 'expected a time of day as HH:mm, 00:00 to 23:59' })
  if (!Number.isInteger(cycle.onDays) || cycle.onDays < 1 || cycle.onDays > MAX_CYCLE_DAYS) {
    issues.push({ field: 'onDays', message: `a cycle needs from 1 to ${MAX_CYCLE_DAYS} working days` })
  }
  if (!Number.isInteger(cycle.offDays) || cycle.offDays < 0 || cycle.offDays > MAX_CYCLE_DAYS) {
    issues.push({ field: 'offDays', message: `off days must be a whole number from 0 to ${MAX_CYCLE_DAYS}` })
  }
  if (isRealDate(cycle.from) && isRealDate(cycle.to)) {
    const days = countRotationDays(cycle.from, cycle.to)
    if (days < 1) issues.push({ field: 'to', message: 'must be on or after from' })
    else if (days > MAX_ROTATION_DAYS) issues.push({ field: 'to', message: `a rotation may span at most ${MAX_ROTATION_DAYS} days (this one spans ${days})` })
  }
  return issues
}

/** Whether the rotation works on a local date (day 0 is `from`). */
export function isRotationWorkingDay(cycle: Pick<RotationCycle, 'from' | 'onDays' | 'offDays'>, date: string): boolean {
  const day = dateNumber(date) - dateNumber(cycle.from)
  return day >= 0 && day % (cycle.onDays + cycle.offDays) < cycle.onDays
}

function offsetMsAt(ms: number, timezone: string): number {
  const iso = formatZonedIso(ms, timezone)
  if (iso.endsWith('Z')) return 0
  const sign = iso[iso.length - 6] === '-' ? -1 : 1
  return sign * (Number(iso.slice(-5, -3)) * 60 + Number(iso.slice(-2))) * MINUTE_MS
}

function readsAs(ms: number, timezone: string, wall: string): boolean {
  return formatZonedIso(ms, timezone).slice(0, 19) === wall
}

/**
 * The instant of a wall-clock time on a local date, by the rotation rule: a time that happens twice
 * (autumn overlap) takes its first occurrence; a time that does not exist (spring-forward gap) moves
 * to the first minute after the gap. The note says when either happened.
 */
export function resolveRotationTime(date: string, time: string, timezone: string): { ms: number, note?: string } {
  const wall = `${date}T${time}:00`
  const asUtc = Date.parse(`${wall}Z`)
  // the offsets in force a day either side: one of them reads this wall clock, unless it is in a gap
  const before = offsetMsAt(asUtc - DAY_MS, timezone)
  const after = offsetMsAt(asUtc + DAY_MS, timezone)
  const matches = [...new Set([before, after])].map(o => asUtc - o).filter(ms => readsAs(ms, timezone, wall)).sort((a, b) => a - b)
  if (matches.length > 1) {
    return { ms: matches[0]!, note: `${date} ${time} happens twice in ${timezone} (clocks go back); the first, ${formatZonedIso(matches[0]!, timezone)}, was used` }
  }
  if (matches.length === 1) return { ms: matches[0]! }
  // in the gap: the change happened between the instant that reads this wall time at the old
  // offset and the one that reads it at the new offset; find it to the minute
  let lo = Math.floor((asUtc - after) / MINUTE_MS)
  let hi = Math.ceil((asUtc - before) / MINUTE_MS)
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2)
    if (offsetMsAt(mid * MINUTE_MS, timezone) === before) lo = mid
    else hi = mid
  }
  const ms = hi * MINUTE_MS
  return { ms, note: `${date} ${time} does not exist in ${timezone} (clocks go forward); ${formatZonedIso(ms, timezone).slice(11, 16)}, the first minute after the gap, was used` }
}

function wallMinutes(time: string): number {
  return Number(time.slice(0, 2)) * 60 + Number(time.slice(3, 5))
}

/** One working day's shift: start on `date`, end the same day or (end at or before start) the next. */
export function planRotationShift(date: string, index: number, cycle: Pick<RotationCycle, 'startTime' | 'endTime'>, timezone: string): PlannedShift {
  const start = resolveRotationTime(date, cycle.startTime, timezone)
  const overnight = wallMinutes(cycle.endTime) <= wallMinutes(cycle.startTime)
  const end = resolveRotationTime(overnight ? addDays(date, 1) : date, cycle.endTime, timezone)
  const timeNotes = [start.note, end.note].filter((n): n is string => Boolean(n))
  let endMs = end.ms
  if (endMs <= start.ms) {
    // both ends fell in one skipped hour: keep the planned length rather than a shift of no time
    const planned = (wallMinutes(cycle.endTime) - wallMinutes(cycle.startTime) + (overnight ? 1440 : 0)) * MINUTE_MS
    endMs = start.ms + planned
    timeNotes.push(`the whole shift on ${date} fell in the skipped hour; it runs its planned length from ${formatZonedIso(start.ms, timezone).slice(11, 16)}`)
  }
  return { date, index, startMs: start.ms, endMs, timeNotes }
}

/** Every shift of a rotation, in date order. The cycle must have no issues (findRotationIssues). */
export function expandRotation(cycle: RotationCycle, timezone: string): PlannedShift[] {
  const days = countRotationDays(cycle.from, cycle.to)
  const planned: PlannedShift[] = []
  for (let day = 0; day < days; day++) {
    if (day % (cycle.onDays + cycle.offDays) >= cycle.onDays) continue
    planned.push(planRotationShift(addDays(cycle.from, day), planned.length, cycle, timezone))
  }
  return planned
}

export interface RotationDayFigures {
  date: string
  shiftId?: number
  minutesBelow: number
  flagged: boolean
  conflicts: number
}

export interface RotationSummary {
  shifts: number
  flagged: number
  minutesBelow: number
}

/** Totals over a rotation's live shifts. */
export function summariseRotation(days: Pick<RotationDayFigures, 'minutesBelow' | 'flagged'>[]): RotationSummary {
  let flagged = 0
  let minutesBelow = 0
  for (const d of days) {
    if (d.flagged) flagged++
    minutesBelow += d.minutesBelow
  }
  return { shifts: days.length, flagged, minutesBelow }
}

/** Days worst first: most minutes short of the light, then most conflicts, then earliest. */
export function rankRotationDays<T extends Pick<RotationDayFigures, 'date' | 'minutesBelow' | 'conflicts'>>(days: T[]): T[] {
  return [...days].sort((a, b) => b.minutesBelow - a.minutesBelow || b.conflicts - a.conflicts || a.date.localeCompare(b.date))
}
