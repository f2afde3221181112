import { and, desc, eq, gt, inArray, isNull, lt, type SQLWrapper } from 'drizzle-orm'
import { z } from 'zod'
import { people, reviews, shiftAssignees, shifts, sites, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { isReviewDecisionCurrent } from '../../shared/review'
import { fieldError } from '../utils/errors'
import { checkShiftLight, computeOutingWindow } from '../core/light/check'
import { InstantSchema, LocalDateSchema } from '../utils/validation'
import { formatZonedIso, localMidnightMs, resolveLocalOrInstant } from '../core/time/zoned'
import type { ShiftConflict, ShiftReply, ShiftReview as ShiftReviewSummary } from '../../shared/types/shift'
import { computeStoredShiftConflicts } from './conflict-context'
import { attachWeatherHolds } from './holds'
import { nowMs } from '../core/time/clock'

export const MAX_SHIFT_MS = 7 * 24 * 3_600_000

export type { ShiftInput, ShiftPatch } from '../../shared/schemas/shift'

export const ShiftListQuerySchema = z.object({
  siteId: z.coerce.number().int().positive().optional(),
  from: z.union([LocalDateSchema, InstantSchema]).optional(),
  to: z.union([LocalDateSchema, InstantSchema]).optional(),
  personId: z.coerce.number().int().positive().optional()
})

export type { ShiftReply, ShiftReview as ShiftReviewSummary } from '../../shared/types/shift'

/** Shapes a stored shift for the API, with its times in the site's zone. */
export function toShiftView(row: Shift, site: Pick<Site, 'name' | 'timezone'>, assignees: { id: number, name: string }[], review: ShiftReviewSummary | null = null, conflicts: ShiftConflict[] = []): ShiftReply {
  const outing = computeOutingWindow(row.startAt.getTime(), row.endAt.getTime(), row.travelMinutes)
  return {
    id: row.id,
    siteId: row.siteId,
    siteName: site.name,
    timezone: site.timezone,
    title: row.title,
    start: formatZonedIso(row.startAt.getTime(), site.timezone),
    end: formatZonedIso(row.endAt.getTime(), site.timezone),
    light: row.light,
    notes: row.notes,
    assigneeIds: assignees.map(a => a.id),
    assignees,
    travelMinutes: row.travelMinutes,
    lightCheck: {
      requirement: row.light,
      minutesBelow: row.minutesBelow,
      flagged: row.flagged,
      checkedFrom: formatZonedIso(outing.fromMs, site.timezone),
      checkedTo: formatZonedIso(outing.toMs, site.timezone)
    },
    reviewState: row.reviewState,
    reviewReasons: (row.reviewReasons ?? []).map(r => r.reason),
    reviewReasonDetails: row.reviewReasons ?? [],
    review,
    conflictOverride: row.conflictOverride,
    conflicts,
    version: row.version,
    cancelled: row.cancelledAt !== null,
    rotationId: row.rotationId ?? null,
    // set from the forecast hours of the outing by attachWeatherHolds (services/holds.ts)
    weatherHold: null
  }
}

// SQLite binds at most 32,766 parameters per statement: a listed set of ids is read in slices of
// this size, and the big reads (a week, a person's shifts, the feed) pass a subquery instead.
const ID_SLICE = 10_000

/** Which shifts a loader reads: a few listed ids, or a subquery selecting shift ids (any number). */
export type ShiftIdScope = number[] | SQLWrapper

function eachIdScope<T>(scope: ShiftIdScope, read: (ids: number[] | SQLWrapper) => T[]): T[] {
  if (!Array.isArray(scope)) return read(scope)
  if (scope.length <= ID_SLICE) return scope.length ? read(scope) : []
  const out: T[] = []
  for (let i = 0; i < scope.length; i += ID_SLICE) out.push(...read(scope.slice(i, i + ID_SLICE)))
  return out
}

/** Assignees of many shifts at once: shiftId → people. */
export function loadAssignees(db: Pick<AppDatabase, 'select'>, scope: ShiftIdScope) {
  const map = new Map<number, { id: number, name: string }[]>()
  const rows = eachIdScope(scope, ids => db.select({ shiftId: shiftAssignees.shiftId, id: people.id, name: people.name })
    .from(shiftAssignees).innerJoin(people, eq(people.id, shiftAssignees.personId))
    .where(inArray(shiftAssignees.shiftId, ids)).all())
  for (const r of rows) {
    const list = map.get(r.shiftId) ?? []
    list.push({ id: r.id, name: r.name })
    map.set(r.shiftId, list)
  }
  return map
}

/** The latest review decision of many shifts at once: shiftId → summary. */
// A decision still applies while the shift's review state is that decision: a change to time, site,
// requirement or people moves the state (back to pending), a new title or note does not.
// `scope` (a subquery selecting the same shifts' ids) replaces the list of the rows' ids when given.
export function loadLatestReviews(db: Pick<AppDatabase, 'select'>, rows: Pick<Shift, 'id' | 'reviewState'>[], scope: ShiftIdScope = rows.map(r => r.id)) {
  const map = new Map<number, ShiftReviewSummary>()
  if (!rows.length) return map
  const states = new Map(rows.map(r => [r.id, r.reviewState]))
  const found = eachIdScope(scope, ids => db.select({ id: reviews.id, shiftId: reviews.shiftId, decision: reviews.decision, mitigations: reviews.mitigations, note: reviews.note, at: reviews.createdAt, shiftVersion: reviews.shiftVersion, reviewerName: people.name })
    .from(reviews).innerJoin(people, eq(people.id, reviews.reviewerId))
    .where(inArray(reviews.shiftId, ids)).orderBy(desc(reviews.id)).all())
  if (Array.isArray(scope) && scope.length > ID_SLICE) found.sort((a, b) => b.id - a.id)
  for (const r of found) {
    if (map.has(r.shiftId) || !states.has(r.shiftId)) continue
    map.set(r.shiftId, { decision: r.decision, mitigations: r.mitigations, note: r.note, reviewerName: r.reviewerName, at: r.at.toISOString(), current: isReviewDecisionCurrent(states.get(r.shiftId)!, r.decision, true) })
  }
  return map
}

/** Resolves and checks start/end against the site's zone: end after start, at most 7 days. */
export function resolveShiftTimes(start: string, end: string, timezone: string) {
  const s = resolveLocalOrInstant(start, timezone)
  const e = resolveLocalOrInstant(end, timezone)
  if (!(e.ms > s.ms)) throw fieldError('end', 'must be after start')
  if (e.ms - s.ms > MAX_SHIFT_MS) throw fieldError('end', 'a shift may last at most 7 days')
  return { startMs: s.ms, endMs: e.ms, notes: [s.note, e.note].filter((n): n is string => Boolean(n)) }
}

/** The stored light check over the outing (start − travel to end + travel). */
export function computeStoredCheck(site: Pick<Site, 'latitude' | 'longitude'>, startMs: number, endMs: number, light: Shift['light'], travelMinutes = 0) {
  const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: light, travelMinutes })
  return { minutesBelow: check.minutesBelow, flagged: check.flagged }
}

/** The site by id, as a 400 naming siteId when there is none (an input error, not a missing page). */
export function requireSiteForShift(db: Pick<AppDatabase, 'select'>, siteId: number) {
  const site = db.select().from(sites).where(eq(sites.id, siteId)).get()
  if (!site) throw fieldError('siteId', `no site with id ${siteId}`)
  if (site.archivedAt) throw fieldError('siteId', 'this site is archived')
  return site
}

/** Every assignee must be an active person; duplicates are dropped. */
export function requireAssignees(db: Pick<AppDatabase, 'select'>, ids: number[]) {
  const unique = [...new Set(ids)]
  if (!unique.length) return unique
  const found = db.select({ id: people.id, active: people.active }).from(people).where(inArray(people.id, unique)).all()
  const missing = unique.filter(id => !found.some(p => p.id === id && p.active))
  if (missing.length) throw fieldError('assigneeIds', `no active person with id ${missing.join(', ')}`)
  return unique
}

/** Shifts overlapping a range: local dates are read in each site's own zone, `to` exclusive. */
export function findShiftsInRange(db: AppDatabase, query: z.infer<typeof ShiftListQuerySchema>): ShiftReply[] {
  const siteRows = db.select().from(sites).where(query.siteId ? eq(sites.id, query.siteId) : undefined).all()
  if (!siteRows.length) return []
  const bounds = new Map(siteRows.map(site => [site.id, rangeForSite(query.from, query.to, site.timezone)]))
  const minStart = Math.min(...[...bounds.values()].map(b => b.startMs))
  const maxEnd = Math.max(...[...bounds.values()].map(b => b.endMs))
  const conditions = [isNull(shifts.cancelledAt), lt(shifts.startAt, new Date(maxEnd)), gt(shifts.endAt, new Date(minStart))]
  // no shift lasts longer than MAX_SHIFT_MS, so none that overlaps the range starts earlier than this:
  // the start index then reads the range alone, not every shift before it
  if (minStart > -8e15) conditions.push(gt(shifts.startAt, new Date(minStart - MAX_SHIFT_MS)))
  if (query.siteId) conditions.push(eq(shifts.siteId, query.siteId))
  if (query.personId) {
    conditions.push(inArray(shifts.id, db.select({ id: shiftAssignees.shiftId }).from(shiftAssignees).where(eq(shiftAssignees.personId, query.personId))))
  }
  const where = and(...conditions)
  const rows = db.select().from(shifts).where(where).orderBy(shifts.startAt).all()
    .filter((row) => {
      const b = bounds.get(row.siteId)
      return b !== undefined && row.startAt.getTime() < b.endMs && row.endAt.getTime() > b.startMs
    })
  // the same selection as a subquery, so that no statement carries one parameter per shift
  const scope = db.select({ id: shifts.id }).from(shifts).where(where)
  const assignees = loadAssignees(db, scope)
  const latest = loadLatestReviews(db, rows, scope)
  const siteById = new Map(siteRows.map(s => [s.id, s]))
  const conflicts = loadShiftRowConflicts(db, rows, assignees)
  return attachWeatherHolds(db, rows.map(row => toShiftView(row, siteById.get(row.siteId)!, assignees.get(row.id) ?? [], latest.get(row.id) ?? null, conflicts.get(row.id) ?? [])), nowMs())
}

/** Work-rule warnings of stored shifts, in one pass for all of them; cancelled shifts have none. */
export function loadShiftRowConflicts(db: Pick<AppDatabase, 'select'>, rows: Shift[], assignees: Map<number, { id: number }[]>) {
  const live = rows.filter(row => row.cancelledAt === null)
  return computeStoredShiftConflicts(db, live.map(row => ({
    shiftId: row.id,
    startMs: row.startAt.getTime(),
    endMs: row.endAt.getTime(),
    personIds: (assignees.get(row.id) ?? []).map(a => a.id)
  })))
}

function rangeForSite(from: string | undefined, to: string | undefined, timezone: string) {
  const toMs = (value: string | undefined, fallback: number) => {
    if (!value) return fallback
    return value.length === 10 ? localMidnightMs(value, timezone) : Date.parse(value)
  }
  return { startMs: toMs(from, -8.64e15), endMs: toMs(to, 8.64e15) }
}

/** One shift as the API shows it, or undefined. */
export function findShiftView(db: AppDatabase, id: number): ShiftReply | undefined {
  const row = db.select().from(shifts).where(eq(shifts.id, id)).get()
  if (!row) return undefined
  const site = db.select().from(sites).where(eq(sites.id, row.siteId)).get()!
  const assignees = loadAssignees(db, [id])
  const conflicts = loadShiftRowConflicts(db, [row], assignees).get(id) ?? []
  return attachWeatherHolds(db, [toShiftView(row, site, assignees.get(id) ?? [], loadLatestReviews(db, [row]).get(id) ?? null, conflicts)], nowMs())[0]
}
