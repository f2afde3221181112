// Loads from the database what the pure conflict check needs, for one shift or a whole listed range
// at once: one query for the assignees' neighbouring shifts, one for their blocked spans, one for
// their names, all over the range widened by the rest period.
import { and, eq, gt, inArray, isNull, lt, sql } from 'drizzle-orm'
import { people, shiftAssignees, shifts, sites, unavailability } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { conflictReachMs, findFirstStartAtOrAfter, findShiftConflicts, type BlockedSpan, type ConflictCandidate, type NeighbourShift, type ShiftConflict, type WorkRules } from '../core/planning/conflicts'
import { loadWorkRules } from './work-rules'

const HOUR_MS = 3_600_000
// the longest a shift may last (MAX_SHIFT_MS in ./shifts, enforced on every write and import)
const LONGEST_SHIFT_MS = 7 * 24 * HOUR_MS

type Reader = Pick<AppDatabase, 'select'>

export interface LoadedConflictContext {
  rules: WorkRules
  byPerson: Map<number, NeighbourShift[]>
  blockedByPerson: Map<number, BlockedSpan[]>
  personNames: Map<number, string>
  // the longest loaded neighbour: how far before a shift a neighbour that reaches it may start
  longestMs: number
}

function groupByPerson<T extends { personId: number }>(rows: T[]) {
  const map = new Map<number, T[]>()
  for (const row of rows) {
    const list = map.get(row.personId) ?? []
    list.push(row)
    map.set(row.personId, list)
  }
  return map
}

function loadNeighbours(db: Reader, personIds: number[], fromMs: number, toMs: number): NeighbourShift[] {
  return db.select({ shiftId: shifts.id, personId: shiftAssignees.personId, startAt: shifts.startAt, endAt: shifts.endAt, title: shifts.title, siteName: sites.name })
    .from(shiftAssignees)
    .innerJoin(shifts, eq(shifts.id, shiftAssignees.shiftId))
    .innerJoin(sites, eq(sites.id, shifts.siteId))
    // read by time, not by person: the start is bounded (no shift lasts longer than LONGEST_SHIFT_MS),
    // and the unary + keeps SQLite off the person index, which would read each person's whole history
    .where(and(inArray(sql`+${shiftAssignees.personId}`, personIds), isNull(shifts.cancelledAt), lt(shifts.startAt, new Date(toMs)), gt(shifts.startAt, new Date(fromMs - LONGEST_SHIFT_MS)), gt(shifts.endAt, new Date(fromMs))))
    .orderBy(shifts.startAt).all()
    .map(r => ({ shiftId: r.shiftId, personId: r.personId, startMs: r.startAt.getTime(), endMs: r.endAt.getTime(), title: r.title, siteName: r.siteName }))
}

function loadBlockedSpans(db: Reader, personIds: number[], fromMs: number, toMs: number): BlockedSpan[] {
  return db.select().from(unavailability)
    .where(and(inArray(unavailability.personId, personIds), lt(unavailability.startAt, new Date(toMs)), gt(unavailability.endAt, new Date(fromMs))))
    .all()
    .map(r => ({ personId: r.personId, startMs: r.startAt.getTime(), endMs: r.endAt.getTime(), reason: r.reason }))
}

function findLongestSpan(list: NeighbourShift[]) {
  let longest = 0
  for (const n of list) if (n.endMs - n.startMs > longest) longest = n.endMs - n.startMs
  return longest
}

// loops rather than Math.min(...list): an import may bring 10,000 candidates
function spanOf(candidates: ConflictCandidate[]) {
  let fromMs = Infinity
  let toMs = -Infinity
  for (const c of candidates) {
    if (c.startMs < fromMs) fromMs = c.startMs
    if (c.endMs > toMs) toMs = c.endMs
  }
  return { fromMs, toMs }
}

/** Everything the conflict check needs for these candidates, in three queries whatever their number. */
export function loadConflictContext(db: Reader, candidates: ConflictCandidate[], rules: WorkRules = loadWorkRules(db)): LoadedConflictContext {
  const personIds = [...new Set(candidates.flatMap(c => c.personIds))]
  const empty = { rules, byPerson: new Map(), blockedByPerson: new Map(), personNames: new Map(), longestMs: 0 }
  if (!personIds.length || !candidates.length) return empty
  const padMs = conflictReachMs(rules)
  const { fromMs, toMs } = spanOf(candidates)
  const names = db.select({ id: people.id, name: people.name }).from(people).where(inArray(people.id, personIds)).all()
  const neighbours = loadNeighbours(db, personIds, fromMs - padMs, toMs + padMs)
  return {
    rules,
    longestMs: findLongestSpan(neighbours),
    byPerson: groupByPerson(neighbours),
    blockedByPerson: groupByPerson(loadBlockedSpans(db, personIds, fromMs, toMs)),
    personNames: new Map(names.map(p => [p.id, p.name]))
  }
}

/** Adds neighbours that are not stored yet (e.g. the other rows of an import), keeping each person's list in start order. */
export function addConflictNeighbours(loaded: LoadedConflictContext, extra: NeighbourShift[]): LoadedConflictContext {
  const byPerson = new Map(loaded.byPerson)
  for (const [personId, list] of groupByPerson(extra)) {
    byPerson.set(personId, [...(byPerson.get(personId) ?? []), ...list].sort((a, b) => a.startMs - b.startMs))
  }
  return { ...loaded, byPerson, longestMs: Math.max(loaded.longestMs, findLongestSpan(extra)) }
}

function nearbyShifts(loaded: LoadedConflictContext, candidate: ConflictCandidate): NeighbourShift[] {
  const padMs = conflictReachMs(loaded.rules)
  const near: NeighbourShift[] = []
  for (const personId of new Set(candidate.personIds)) {
    const list = loaded.byPerson.get(personId) ?? []
    const end = candidate.endMs + padMs
    for (let i = findFirstStartAtOrAfter(list, candidate.startMs - padMs - loaded.longestMs); i < list.length && list[i]!.startMs < end; i++) {
      near.push(list[i]!)
    }
  }
  return near
}

/** The conflicts of one candidate against a loaded context (extra neighbours, e.g. other rows of an import, may be added). */
export function checkConflictsWith(loaded: LoadedConflictContext, candidate: ConflictCandidate, extra: NeighbourShift[] = []): ShiftConflict[] {
  const unavailable = [...new Set(candidate.personIds)].flatMap(id => loaded.blockedByPerson.get(id) ?? [])
  const otherShifts = extra.length ? [...nearbyShifts(loaded, candidate), ...extra] : nearbyShifts(loaded, candidate)
  return findShiftConflicts(candidate, { otherShifts, unavailable, personNames: loaded.personNames }, loaded.rules)
}

/** Conflicts of many stored shifts at once: shift id → warnings. */
export function computeStoredShiftConflicts(db: Reader, candidates: (ConflictCandidate & { shiftId: number })[]): Map<number, ShiftConflict[]> {
  const loaded = loadConflictContext(db, candidates)
  return new Map(candidates.map(c => [c.shiftId, checkConflictsWith(loaded, c)]))
}

/** Conflicts of one shift, stored or not (a stored one gives its id so it is not its own neighbour). */
export function computeCandidateConflicts(db: Reader, candidate: ConflictCandidate): ShiftConflict[] {
  return checkConflictsWith(loadConflictContext(db, [candidate]), candidate)
}
