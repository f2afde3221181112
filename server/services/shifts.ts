import { createError } from 'h3'
import { and, desc, eq, gt, inArray, isNull, lt } from 'drizzle-orm'
import { z } from 'zod'
import { LIGHT_REQUIREMENTS, people, reviews, shiftAssignees, shifts, sites, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { checkShiftLight } from '../core/light/check'
import { InstantSchema, LocalDateSchema } from '../utils/validation'
import { formatZonedIso, localMidnightMs, resolveLocalOrInstant } from '../core/time/zoned'
import type { ShiftConflict, ShiftReply as ShiftView, ShiftReview as ShiftReviewSummary } from '../../shared/types/shift'
import { computeStoredShiftConflicts } from './conflict-context'

export const MAX_SHIFT_MS = 7 * 24 * 3_600_000

const ShiftTimeSchema = z.union([
  InstantSchema,
  z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/)
], { error: 'expected an ISO 8601 instant, or a local time YYYY-MM-DDTHH:mm in the site\'s zone' })

export const ShiftBodySchema = z.object({
  siteId: z.number({ error: 'expected a site id' }).int().positive(),
  title: z.string().trim().min(1, 'required').max(200),
  start: ShiftTimeSchema,
  end: ShiftTimeSchema,
  light: z.enum(LIGHT_REQUIREMENTS, { error: 'must be daylight, civil or any' }),
  assigneeIds: z.array(z.number().int().positive(), { error: 'expected a list of person ids' }).max(200).default([]),
  notes: z.string().max(4000).optional(),
  overrideReason: z.string().trim().max(1000).optional()
})
export type ShiftInput = z.infer<typeof ShiftBodySchema>

export const ShiftPatchSchema = ShiftBodySchema.partial().extend({
  // no default here: zod 4 still applies the body's default([]) under partial(), and a patch that
  // leaves the people out (a drag on the calendar) must keep them, not empty the shift
  assigneeIds: z.array(z.number().int().positive(), { error: 'expected a list of person ids' }).max(200).optional(),
  version: z.number({ error: 'expected the version you edited' }).int().positive().optional()
})
export type ShiftPatch = z.infer<typeof ShiftPatchSchema>

export const ShiftListQuerySchema = z.object({
  siteId: z.coerce.number().int().positive().optional(),
  from: z.union([LocalDateSchema, InstantSchema]).optional(),
  to: z.union([LocalDateSchema, InstantSchema]).optional(),
  personId: z.coerce.number().int().positive().optional()
})

export type { ShiftReply as ShiftView, ShiftReview as ShiftReviewSummary } from '../../shared/types/shift'

function fieldError(field: string, message: string) {
  return createError({ statusCode: 400, statusMessage: 'Bad Request', message: `Invalid ${field}: ${message}`, data: { issues: [{ field, message }] } })
}

/** Shapes a stored shift for the API, with its times in the site's zone. */
export function toShiftView(row: Shift, site: Pick<Site, 'name' | 'timezone'>, assignees: { id: number, name: string }[], review: ShiftReviewSummary | null = null, conflicts: ShiftConflict[] = []): ShiftView {
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
    lightCheck: { requirement: row.light, minutesBelow: row.minutesBelow, flagged: row.flagged },
    reviewState: row.reviewState,
    review,
    conflictOverride: row.conflictOverride,
    conflicts,
    version: row.version,
    cancelled: row.cancelledAt !== null,
    rotationId: row.rotationId ?? null
  }
}

/** Assignees of many shifts at once: shiftId → people. */
export function loadAssignees(db: Pick<AppDatabase, 'select'>, shiftIds: number[]) {
  const map = new Map<number, { id: number, name: string }[]>()
  if (!shiftIds.length) return map
  const rows = db.select({ shiftId: shiftAssignees.shiftId, id: people.id, name: people.name })
    .from(shiftAssignees).innerJoin(people, eq(people.id, shiftAssignees.personId))
    .where(inArray(shiftAssignees.shiftId, shiftIds)).all()
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
export function loadLatestReviews(db: Pick<AppDatabase, 'select'>, rows: Pick<Shift, 'id' | 'reviewState'>[]) {
  const map = new Map<number, ShiftReviewSummary>()
  if (!rows.length) return map
  const states = new Map(rows.map(r => [r.id, r.reviewState]))
  const found = db.select({ shiftId: reviews.shiftId, decision: reviews.decision, mitigations: reviews.mitigations, note: reviews.note, at: reviews.createdAt, shiftVersion: reviews.shiftVersion, reviewerName: people.name })
    .from(reviews).innerJoin(people, eq(people.id, reviews.reviewerId))
    .where(inArray(reviews.shiftId, rows.map(r => r.id))).orderBy(desc(reviews.id)).all()
  for (const r of found) {
    if (map.has(r.shiftId)) continue
    map.set(r.shiftId, { decision: r.decision, mitigations: r.mitigations, note: r.note, reviewerName: r.reviewerName, at: r.at.toISOString(), current: states.get(r.shiftId) === r.decision })
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

/** The stored light check and the review state it implies. */
export function computeStoredCheck(site: Pick<Site, 'latitude' | 'longitude'>, startMs: number, endMs: number, light: Shift['light']) {
  const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: light })
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
export function findShiftsInRange(db: AppDatabase, query: z.infer<typeof ShiftListQuerySchema>): ShiftView[] {
  const siteRows = db.select().from(sites).where(query.siteId ? eq(sites.id, query.siteId) : undefined).all()
  if (!siteRows.length) return []
  const bounds = new Map(siteRows.map(site => [site.id, rangeForSite(query.from, query.to, site.timezone)]))
  const minStart = Math.min(...[...bounds.values()].map(b => b.startMs))
  const maxEnd = Math.max(...[...bounds.values()].map(b => b.endMs))
  const conditions = [isNull(shifts.cancelledAt), lt(shifts.startAt, new Date(maxEnd)), gt(shifts.endAt, new Date(minStart))]
  if (query.siteId) conditions.push(eq(shifts.siteId, query.siteId))
  if (query.personId) {
    const ids = db.select({ id: shiftAssignees.shiftId }).from(shiftAssignees).where(eq(shiftAssignees.personId, query.personId)).all().map(r => r.id)
    conditions.push(inArray(shifts.id, ids))
  }
  const rows = db.select().from(shifts).where(and(...conditions)).orderBy(shifts.startAt).all()
    .filter((row) => {
      const b = bounds.get(row.siteId)
      return b !== undefined && row.startAt.getTime() < b.endMs && row.endAt.getTime() > b.startMs
    })
  const assignees = loadAssignees(db, rows.map(r => r.id))
  const latest = loadLatestReviews(db, rows)
  const siteById = new Map(siteRows.map(s => [s.id, s]))
  const conflicts = loadShiftRowConflicts(db, rows, assignees)
  return rows.map(row => toShiftView(row, siteById.get(row.siteId)!, assignees.get(row.id) ?? [], latest.get(row.id) ?? null, conflicts.get(row.id) ?? []))
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
export function findShiftView(db: AppDatabase, id: number): ShiftView | undefined {
  const row = db.select().from(shifts).where(eq(shifts.id, id)).get()
  if (!row) return undefined
  const site = db.select().from(sites).where(eq(sites.id, row.siteId)).get()!
  const assignees = loadAssignees(db, [id])
  const conflicts = loadShiftRowConflicts(db, [row], assignees).get(id) ?? []
  return toShiftView(row, site, assignees.get(id) ?? [], loadLatestReviews(db, [row]).get(id) ?? null, conflicts)
}
