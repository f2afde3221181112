// Work-rule warnings for a shift: one person on two overlapping shifts, too little rest between two
// of a person's shifts, a shift longer than the work rules allow, and an assignee who is blocked
// (leave, travel). These are warnings a coordinator may override with a stated reason, never a
// refusal, and they do not replace local codes or the employer's working-time procedures.
// Pure: plain inputs, plain outputs, no framework or database imports.
import { formatDuration } from '../../../shared/format'
import type { ShiftConflict } from '../../../shared/types/shift'

export type { ShiftConflict, ShiftConflictKind } from '../../../shared/types/shift'

export interface ConflictCandidate {
  // the stored shift being checked, left out of its own neighbours
  shiftId?: number
  startMs: number
  endMs: number
  personIds: number[]
}

/** One assignment of a person to another shift (one row per person and shift). */
export interface NeighbourShift {
  shiftId: number
  personId: number
  startMs: number
  endMs: number
  title: string
  siteName: string
}

export interface BlockedSpan {
  personId: number
  startMs: number
  endMs: number
  reason: string
}

export interface ConflictContext {
  otherShifts: NeighbourShift[]
  unavailable: BlockedSpan[]
  personNames: Map<number, string> | Record<number, string>
}

export interface WorkRules {
  minRestHours: number
  maxShiftHours: number
  /** Hours of work in any 7 days above which each shift says so; null or absent: not checked. */
  weeklyLimitHours?: number | null
}

const WEEK_MS = 7 * 24 * 3_600_000

/** How far before and after a shift its neighbours matter: the rest period, or a week with the weekly limit on. */
export function conflictReachMs(rules: WorkRules): number {
  return Math.max(rules.minRestHours * 3_600_000, rules.weeklyLimitHours ? WEEK_MS : 0)
}

const HOUR_MS = 3_600_000
const MINUTE_MS = 60_000
const DAY_HOURS = 24

function nameOf(names: ConflictContext['personNames'], id: number): string | null {
  const name = names instanceof Map ? names.get(id) : names[id]
  return name ?? null
}

function describeDuration(ms: number): string {
  return formatDuration(Math.round(ms / MINUTE_MS))
}

function describeHours(hours: number): string {
  return formatDuration(hours * 60)
}

/** The 'long' warning when the shift lasts longer than the work rules' maximum (exactly the maximum is fine). */
export function findLongShiftConflict(candidate: ConflictCandidate, rules: WorkRules): ShiftConflict | null {
  const lengthMs = candidate.endMs - candidate.startMs
  if (lengthMs <= rules.maxShiftHours * HOUR_MS) return null
  return {
    kind: 'long',
    personId: null,
    personName: null,
    otherShiftId: null,
    message: `This shift lasts ${describeDuration(lengthMs)}, longer than the ${describeHours(rules.maxShiftHours)} maximum in the work rules`
  }
}

/**
 * Whether two non-overlapping shifts of one person leave too little rest. EU Working Time Directive
 * 2003/88/EC art. 3 asks for 11 consecutive hours of rest in every 24 hours. A gap shorter than the
 * minimum is a break inside one working day when the two shifts together still fit within
 * 24 − minimum hours (a 09–13 and 13–17 split day leaves 16 h of rest); it is a short rest when they
 * spread wider than that (19–23 then 06–10 the next morning: 7 h of rest). Exactly the minimum is fine.
 */
export function isRestTooShort(first: { startMs: number, endMs: number }, second: { startMs: number, endMs: number }, minRestHours: number): boolean {
  const [early, late] = first.startMs <= second.startMs ? [first, second] : [second, first]
  const gapMs = late.startMs - early.endMs
  if (gapMs < 0 || gapMs >= minRestHours * HOUR_MS) return false
  const spreadMs = Math.max(early.endMs, late.endMs) - early.startMs
  return spreadMs > (DAY_HOURS - minRestHours) * HOUR_MS
}

function overlaps(a: { startMs: number, endMs: number }, b: { startMs: number, endMs: number }) {
  return a.startMs < b.endMs && b.startMs < a.endMs
}

function describeRest(candidate: ConflictCandidate, other: NeighbourShift, who: string, minRestHours: number): string {
  const gapMs = other.startMs >= candidate.endMs ? other.startMs - candidate.endMs : candidate.startMs - other.endMs
  const spreadMs = Math.max(candidate.endMs, other.endMs) - Math.min(candidate.startMs, other.startMs)
  const rule = `the work rules ask for ${describeHours(minRestHours)} of rest in 24 h`
  if (spreadMs <= DAY_HOURS * HOUR_MS) {
    return `${who} has ${describeDuration(gapMs)} between this shift and “${other.title}” at ${other.siteName}, and together they spread over ${describeDuration(spreadMs)}: ${rule}`
  }
  return `${who} has only ${describeDuration(gapMs)} of rest between this shift and “${other.title}” at ${other.siteName}: ${rule}`
}

interface Assignee { personId: number, personName: string | null, who: string }

function findNeighbourConflicts(candidate: ConflictCandidate, person: Assignee, others: NeighbourShift[], rules: WorkRules, found: ShiftConflict[]) {
  const { personId, personName, who } = person
  const seen = new Set<number>()
  for (const other of others) {
    if (other.personId !== personId || other.shiftId === candidate.shiftId || seen.has(other.shiftId)) continue
    seen.add(other.shiftId)
    const base = { personId, personName, otherShiftId: other.shiftId }
    if (overlaps(candidate, other)) {
      found.push({ ...base, kind: 'overlap', message: `${who} is also on “${other.title}” at ${other.siteName} at the same time` })
    } else if (isRestTooShort(candidate, other, rules.minRestHours)) {
      found.push({ ...base, kind: 'rest', message: describeRest(candidate, other, who, rules.minRestHours) })
    }
  }
}

function findBlockedConflicts(candidate: ConflictCandidate, person: Assignee, spans: BlockedSpan[], found: ShiftConflict[]) {
  for (const span of spans) {
    if (span.personId !== person.personId || !overlaps(candidate, span)) continue
    const reason = span.reason ? ` (${span.reason})` : ''
    found.push({ kind: 'unavailable', personId: person.personId, personName: person.personName, otherShiftId: null, message: `${person.who} is unavailable during this shift${reason}` })
  }
}

/**
 * The weekly limit: a person's hours of work in the 7 days that end when this shift ends (this shift
 * and the parts of their other shifts inside that window). EU Working Time Directive 2003/88/EC art. 6
 * sets 48 hours as the average over a reference period (up to 4 months, art. 16); a rolling 7-day
 * figure is stricter than the directive and is reported as a warning for the planner to weigh.
 */
export function findWeeklyHoursConflict(candidate: ConflictCandidate, person: Assignee, others: NeighbourShift[], limitHours: number): ShiftConflict | null {
  const fromMs = candidate.endMs - WEEK_MS
  let workedMs = candidate.endMs - Math.max(candidate.startMs, fromMs)
  const seen = new Set<number>()
  for (const other of others) {
    if (other.personId !== person.personId || other.shiftId === candidate.shiftId || seen.has(other.shiftId)) continue
    seen.add(other.shiftId)
    workedMs += Math.max(0, Math.min(other.endMs, candidate.endMs) - Math.max(other.startMs, fromMs))
  }
  if (workedMs <= limitHours * HOUR_MS) return null
  return {
    kind: 'weekly', personId: person.personId, personName: person.personName, otherShiftId: null,
    message: `${person.who} works ${describeDuration(workedMs)} in the 7 days to the end of this shift, over the ${describeHours(limitHours)} weekly limit in the work rules (EU Directive 2003/88/EC art. 6 limits the average over a reference period; your agreement and local law decide)`
  }
}

/** Every work-rule warning for a shift and its assignees, given their other shifts and blocked spans. */
export function findShiftConflicts(candidate: ConflictCandidate, context: ConflictContext, rules: WorkRules): ShiftConflict[] {
  const conflicts: ShiftConflict[] = []
  const long = findLongShiftConflict(candidate, rules)
  if (long) conflicts.push(long)
  for (const personId of new Set(candidate.personIds)) {
    const personName = nameOf(context.personNames, personId)
    const person = { personId, personName, who: personName ?? `Person #${personId}` }
    findNeighbourConflicts(candidate, person, context.otherShifts, rules, conflicts)
    findBlockedConflicts(candidate, person, context.unavailable, conflicts)
    const weekly = rules.weeklyLimitHours ? findWeeklyHoursConflict(candidate, person, context.otherShifts, rules.weeklyLimitHours) : null
    if (weekly) conflicts.push(weekly)
  }
  return conflicts
}

/** First index of a start-sorted list of shifts whose start is at or after `ms` (binary search). */
export function findFirstStartAtOrAfter(list: { startMs: number }[], ms: number): number {
  let lo = 0
  let hi = list.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (list[mid]!.startMs < ms) lo = mid + 1
    else hi = mid
  }
  return lo
}
