// The slot finder: quarter-hour starts at which a task of a given length lies wholly in the light
// its requirement needs (docs/light-model.md: daylight needs `day`, civil needs `day` or `civil`, any is
// anywhere) and fits its people's other shifts, blocked spans and work rules. The rules are the
// planning module's own (conflicts.ts), so a proposed slot never raises a warning the calendar would.
// Pure TypeScript: plain inputs, plain outputs, no framework or database imports.
import { BANDS_MEETING_REQUIREMENT, type LightDayMs, type LightRequirement } from '../../../shared/light'
import type { SlotRank, SlotReasonCode } from '../../../shared/outlook'
import { formatDate, formatDuration } from '../../../shared/format'
import { describeRequirement } from '../../../shared/planning'
import { findFirstStartAtOrAfter, findShiftConflicts, type BlockedSpan, type ConflictContext, type NeighbourShift, type ShiftConflictKind, type WorkRules } from './conflicts'

const MINUTE_MS = 60_000
/** Slots start on a quarter hour of the local clock (every zone offset in use is a multiple of 15 min). */
export const SLOT_STEP_MINUTES = 15
export const MAX_SLOTS_PER_DAY = 4

export interface SlotPerson { id: number, name: string }

export interface SlotSearchInput {
  /** The engine's local days: every day of the window, plus any after it that a late slot may run into. */
  days: Pick<LightDayMs, 'date' | 'startMs' | 'endMs' | 'periods'>[]
  /** Local dates (inclusive) on which slots may start. */
  from: string
  to: string
  durationMinutes: number
  requirement: LightRequirement
  people: SlotPerson[]
  /** How many of `people` the task needs; all of them when absent. */
  headcount?: number
  context: ConflictContext
  rules: WorkRules
  rank: SlotRank
  perDay?: number
  /** No slot starts (no party leaves) before this instant (now, for a real search). */
  notBeforeMs?: number
  /**
   * Minutes of travel each way. Slots are time on site; the whole outing, start − travel to
   * end + travel, must lie in the light (docs/api.md, "Travel, weather holds and the field"). `days` must then reach far enough
   * before the first and after the last local day for the trip.
   */
  travelMinutes?: number
}

export interface SlotMs {
  date: string
  startMs: number
  endMs: number
  /** Usable light before the start / after the end, in minutes; null when it reaches past the data. */
  lightBeforeMinutes: number | null
  lightAfterMinutes: number | null
  assigneeIds: number[]
}

export interface SlotSearchOutcome {
  slots: SlotMs[]
  reason: string | null
  reasonCode: SlotReasonCode
  daysWithSlots: number
  daysSearched: number
}

interface Interval { startMs: number, endMs: number, openStart: boolean, openEnd: boolean }

type Blocker = Exclude<ShiftConflictKind, 'long'>

interface StartCheck {
  ok: boolean
  free: number[]
  /** Per person who cannot take the slot, the first rule that blocks them. */
  blocked: Map<number, { kind: Blocker, message: string }>
}

/** Stretches of usable light for a requirement, merged across local midnights. */
export function findUsableIntervals(days: SlotSearchInput['days'], requirement: LightRequirement): Interval[] {
  const allowed = BANDS_MEETING_REQUIREMENT[requirement]
  const out: Interval[] = []
  for (const day of days) {
    for (const p of day.periods) {
      if (!allowed.includes(p.kind)) continue
      const last = out[out.length - 1]
      if (last && last.endMs === p.startMs) last.endMs = p.endMs
      else out.push({ startMs: p.startMs, endMs: p.endMs, openStart: false, openEnd: false })
    }
  }
  const first = days[0]
  const lastDay = days[days.length - 1]
  if (out.length && first && out[0]!.startMs <= first.startMs) out[0]!.openStart = true
  if (out.length && lastDay && out[out.length - 1]!.endMs >= lastDay.endMs) out[out.length - 1]!.openEnd = true
  return out
}

interface PersonRoster {
  /** The person's other shifts, sorted by start. */
  shifts: NeighbourShift[]
  unavailable: BlockedSpan[]
  names: ConflictContext['personNames']
  /** The longest of their other shifts, so a search back from a start knows how far to look. */
  longestMs: number
}

// Each person's own shifts and blocked spans, sorted, so a check looks only at theirs.
function buildRosters(context: ConflictContext, people: SlotPerson[]): Map<number, PersonRoster> {
  const map = new Map<number, PersonRoster>()
  for (const person of people) {
    const own = context.otherShifts.filter(s => s.personId === person.id).sort((a, b) => a.startMs - b.startMs)
    map.set(person.id, {
      shifts: own,
      unavailable: context.unavailable.filter(s => s.personId === person.id),
      names: { [person.id]: person.name },
      longestMs: own.reduce((m, s) => Math.max(m, s.endMs - s.startMs), 0)
    })
  }
  return map
}

// The person's shifts that can touch [startMs, endMs) under the rules: overlapping it, or closer than
// the rest period on either side. Only those go to the conflict check; farther ones cannot conflict.
function findNearShifts(roster: PersonRoster, startMs: number, endMs: number, restMs: number): NeighbourShift[] {
  const near: NeighbourShift[] = []
  for (let i = findFirstStartAtOrAfter(roster.shifts, startMs - restMs - roster.longestMs); i < roster.shifts.length && roster.shifts[i]!.startMs < endMs + restMs; i++) {
    const s = roster.shifts[i]!
    if (s.endMs > startMs - restMs) near.push(s)
  }
  return near
}

// Which people can take [startMs, endMs) under the rules, and what blocks the others.
function checkPeople(startMs: number, endMs: number, people: SlotPerson[], rosters: Map<number, PersonRoster>, rules: WorkRules, need: number): StartCheck {
  const free: number[] = []
  const blocked = new Map<number, { kind: Blocker, message: string }>()
  const restMs = rules.minRestHours * 3_600_000
  for (const person of people) {
    const roster = rosters.get(person.id)!
    const near = findNearShifts(roster, startMs, endMs, restMs)
    const away = roster.unavailable.filter(u => u.startMs < endMs && startMs < u.endMs)
    if (!near.length && !away.length) {
      free.push(person.id)
      continue
    }
    const found = findShiftConflicts({ startMs, endMs, personIds: [person.id] }, { otherShifts: near, unavailable: away, personNames: roster.names }, rules)
      .filter(c => c.kind !== 'long')
    if (found.length === 0) free.push(person.id)
    else blocked.set(person.id, { kind: found[0]!.kind as Blocker, message: found[0]!.message })
  }
  return { ok: free.length >= need, free: free.slice(0, need), blocked }
}

function minutesOrNull(ms: number, open: boolean): number | null {
  return open ? null : Math.round(ms / MINUTE_MS)
}

export interface DayScan {
  valid: SlotMs[]
  lightFits: number
  blockers: Map<string, { kind: Blocker, message: string, count: number }>
  past: number
}

// Every quarter-hour start of one local day, checked for light and people.
function scanDay(day: SlotSearchInput['days'][number], input: SlotSearchInput, intervals: Interval[], rosters: Map<number, PersonRoster>, need: number): DayScan {
  const scan: DayScan = { valid: [], lightFits: 0, blockers: new Map(), past: 0 }
  const durationMs = input.durationMinutes * MINUTE_MS
  const travelMs = (input.travelMinutes ?? 0) * MINUTE_MS
  let k = 0
  for (let startMs = day.startMs; startMs < day.endMs; startMs += SLOT_STEP_MINUTES * MINUTE_MS) {
    const endMs = startMs + durationMs
    const leaveMs = startMs - travelMs
    const backMs = endMs + travelMs
    while (k < intervals.length && intervals[k]!.endMs < backMs) k++
    const interval = intervals[k]
    if (!interval || interval.startMs > leaveMs) continue
    if (input.notBeforeMs !== undefined && leaveMs < input.notBeforeMs) {
      scan.past++
      continue
    }
    scan.lightFits++
    const check = checkPeople(startMs, endMs, input.people, rosters, input.rules, need)
    if (check.ok) {
      scan.valid.push({
        date: day.date, startMs, endMs,
        lightBeforeMinutes: minutesOrNull(leaveMs - interval.startMs, interval.openStart),
        lightAfterMinutes: minutesOrNull(interval.endMs - backMs, interval.openEnd),
        assigneeIds: check.free
      })
      continue
    }
    for (const [personId, b] of check.blocked) {
      const key = `${personId}:${b.kind}`
      const entry = scan.blockers.get(key) ?? { ...b, count: 0 }
      entry.count++
      scan.blockers.set(key, entry)
    }
  }
  return scan
}

function compareSlots(rank: SlotRank) {
  const after = (s: SlotMs) => s.lightAfterMinutes ?? Number.POSITIVE_INFINITY
  return (a: SlotMs, b: SlotMs) => {
    if (rank === 'margin' && after(a) !== after(b)) return after(b) - after(a)
    return a.startMs - b.startMs
  }
}

// The best slots of one day that do not overlap one another.
function pickDaySlots(valid: SlotMs[], rank: SlotRank, perDay: number): SlotMs[] {
  const picked: SlotMs[] = []
  for (const slot of [...valid].sort(compareSlots(rank))) {
    if (picked.length >= perDay) break
    if (picked.every(p => slot.endMs <= p.startMs || slot.startMs >= p.endMs)) picked.push(slot)
  }
  return picked
}

/** Every valid quarter-hour start in the window, day by day (the finder's raw material; tests compare it with brute force). */
export function listValidSlotStarts(input: SlotSearchInput): { scans: Map<string, DayScan>, windowDays: SlotSearchInput['days'] } {
  const intervals = findUsableIntervals(input.days, input.requirement)
  const rosters = buildRosters(input.context, input.people)
  const need = input.headcount ?? input.people.length
  const windowDays = input.days.filter(d => d.date >= input.from && d.date <= input.to)
  const scans = new Map<string, DayScan>()
  for (const day of windowDays) scans.set(day.date, scanDay(day, input, intervals, rosters, need))
  return { scans, windowDays }
}

/** The best slots of each local day of the window, ranked, or the reason there are none. */
export function findSlots(input: SlotSearchInput): SlotSearchOutcome {
  const daysSearched = input.days.filter(d => d.date >= input.from && d.date <= input.to).length
  if (input.durationMinutes > input.rules.maxShiftHours * 60) {
    const reason = `A ${formatDuration(input.durationMinutes)} task is longer than the ${formatDuration(input.rules.maxShiftHours * 60)} longest shift the work rules allow. Split it into shorter shifts, or change the work rules if your regime allows longer ones.`
    return { slots: [], reason, reasonCode: 'max-length', daysWithSlots: 0, daysSearched }
  }
  const { scans } = listValidSlotStarts(input)
  const perDay = Math.min(Math.max(1, input.perDay ?? 1), MAX_SLOTS_PER_DAY)
  const slots: SlotMs[] = []
  let daysWithSlots = 0
  for (const scan of scans.values()) {
    const picked = pickDaySlots(scan.valid, input.rank, perDay)
    if (picked.length) daysWithSlots++
    slots.push(...picked)
  }
  slots.sort(compareSlots(input.rank))
  if (slots.length) return { slots, reason: null, reasonCode: null, daysWithSlots, daysSearched }
  return { slots, ...explainNoSlot(input, [...scans.values()]), daysWithSlots, daysSearched }
}

function describeSoughtLight(requirement: LightRequirement): string {
  return requirement === 'any' ? 'the window' : describeRequirement(requirement)
}

// Longest stretch of usable light that starts on a day of the window, for the "no light" reason.
function describeLongestLight(input: SlotSearchInput): string {
  let best: { minutes: number, date: string } | null = null
  for (const interval of findUsableIntervals(input.days, input.requirement)) {
    const day = input.days.find(d => interval.startMs >= d.startMs && interval.startMs < d.endMs)
    if (!day || day.date < input.from || day.date > input.to) continue
    const minutes = Math.round((interval.endMs - interval.startMs) / MINUTE_MS)
    if (!best || minutes > best.minutes) best = { minutes, date: day.date }
  }
  if (!best) return `There is no ${describeSoughtLight(input.requirement)} at all at this site from ${formatDate(input.from)} to ${formatDate(input.to)}.`
  return `The longest stretch of ${describeSoughtLight(input.requirement)} from ${formatDate(input.from)} to ${formatDate(input.to)} is ${formatDuration(best.minutes)}, on ${formatDate(best.date)}; the task needs ${formatDuration(input.durationMinutes)}${input.travelMinutes ? ` plus ${formatDuration(input.travelMinutes)} of travel each way` : ''}.`
}

function explainNoSlot(input: SlotSearchInput, scans: DayScan[]): { reason: string, reasonCode: SlotReasonCode } {
  const lightFits = scans.reduce((n, s) => n + s.lightFits, 0)
  const past = scans.reduce((n, s) => n + s.past, 0)
  if (lightFits === 0 && past > 0) {
    return { reasonCode: 'past', reason: 'Every start with enough light in this window has already passed. Search later dates.' }
  }
  if (lightFits === 0) return { reasonCode: 'light', reason: `No usable light long enough. ${describeLongestLight(input)}` }
  const totals = new Map<string, { kind: Blocker, message: string, count: number }>()
  for (const scan of scans) {
    for (const [key, b] of scan.blockers) {
      const entry = totals.get(key) ?? { ...b, count: 0 }
      entry.count += b.count
      totals.set(key, entry)
    }
  }
  const ranked = [...totals.values()].sort((a, b) => b.count - a.count)
  const kinds = new Map<Blocker, number>()
  for (const r of ranked) kinds.set(r.kind, (kinds.get(r.kind) ?? 0) + r.count)
  const top = [...kinds.entries()].sort((a, b) => b[1] - a[1])[0]![0]
  const code: SlotReasonCode = top === 'unavailable' ? 'unavailable' : top === 'rest' ? 'rest' : 'busy'
  const lead = code === 'unavailable' ? 'People unavailable.' : code === 'rest' ? 'Rest rules.' : 'People already on other shifts.'
  const examples = ranked.slice(0, 3).map(r => r.message).join('; ')
  const lightDays = scans.filter(s => s.lightFits > 0).length
  return { reasonCode: code, reason: `${lead} There is enough light on ${lightDays} ${lightDays === 1 ? 'day' : 'days'}, but no start fits the people: ${examples}.` }
}
