// Safety review decisions and the review queue, on the database. A decision, the shift's review
// state and its audit entry are written in one transaction; the queue is shaped by review-queue.ts.
import { and, asc, desc, eq, gt, inArray, isNull, ne, sql } from 'drizzle-orm'
import { z } from 'zod'
import { auditLog, people, reviews, shiftAssignees, shifts, sites, type Shift, type Site } from '../db/schema'
import {
  CHECK_IN_MINUTES, CHECK_IN_PREFIX, MAX_MITIGATION_TEXT, MAX_REVIEW_NOTE, MITIGATION_KEYS, OTHER_MITIGATION_PREFIX,
  REVIEW_DECISIONS, REVIEW_QUEUE_STATES, describeMitigation, describeReviewReason, type ReviewQueueState, type ReviewReasonDetail, type ReviewShiftSnapshot,
  isReviewDecisionCurrent
} from '../../shared/review'
import { formatDay, formatTimeRange } from '../../shared/format'
import { localDateOf } from '../core/time/zone-table'
import { renderReviewOutcomeMail } from '../../emails/review-outcome'
import { computeReviewReasons, type ReviewWindow } from '../core/review/reasons'
import { computeLightPeriodsInRange } from '../core/light/index'
import { formatZonedIso } from '../core/time/zoned'
import { deliverOutboxMessage, enqueueOutboxMessage } from './outbox'
import { loadWorkRules } from './work-rules'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { buildRotationQueueGroups, splitRotationRows } from './rotation-queue'
import { conflict, notFound } from '../utils/errors'
import { checkShiftLight, computeOutingWindow } from '../core/light/check'
import { compareReviewQueueItems, shapeReviewQueueItem, type ReviewQueueItem } from '../core/review/queue'
import { loadAssignees, loadLatestReviews, loadShiftRowConflicts, toShiftView, type ShiftReviewSummary } from './shifts'
import type { ShiftConflict } from '../core/planning/conflicts'
import { describeWindowWeather, loadSiteForecast, loadSiteObservations, type ObservationRow, type SiteForecastState } from './site-weather'
import { nowDate, nowMs as clockNowMs } from '../core/time/clock'
import { attachWeatherHolds } from './holds'

const HOUR_MS = 3_600_000

// Normalises one mitigation: a fixed key, 'check-in-interval:<minutes>', or 'other:<free text>'.
function normaliseMitigation(item: string, checkInMinutes: number | undefined): string | { message: string } {
  const value = item.trim()
  if (value === 'check-in-interval') {
    if (checkInMinutes === undefined) return { message: 'a check-in interval needs its minutes (checkInMinutes, or write check-in-interval:30)' }
    return `${CHECK_IN_PREFIX}${checkInMinutes}`
  }
  if (value.startsWith(CHECK_IN_PREFIX)) {
    const minutes = Number(value.slice(CHECK_IN_PREFIX.length))
    if (!Number.isInteger(minutes) || minutes < CHECK_IN_MINUTES.min || minutes > CHECK_IN_MINUTES.max) {
      return { message: `the check-in interval must be a whole number of minutes from ${CHECK_IN_MINUTES.min} to ${CHECK_IN_MINUTES.max}` }
    }
    return `${CHECK_IN_PREFIX}${minutes}`
  }
  if (value.startsWith(OTHER_MITIGATION_PREFIX)) {
    const text = value.slice(OTHER_MITIGATION_PREFIX.length).trim()
    if (!text) return { message: 'describe the other mitigation after "other:"' }
    if (text.length > MAX_MITIGATION_TEXT) return { message: `an other mitigation may be at most ${MAX_MITIGATION_TEXT} characters` }
    return `${OTHER_MITIGATION_PREFIX}${text}`
  }
  if ((MITIGATION_KEYS as readonly string[]).includes(value)) return value
  // any other text is a mitigation in the reviewer's own words, kept verbatim (docs/api.md: string[])
  if (!value) return { message: 'a mitigation may not be empty' }
  if (value.length > MAX_MITIGATION_TEXT) return { message: `a mitigation may be at most ${MAX_MITIGATION_TEXT} characters` }
  return value
}

/** Validates POST /api/shifts/:id/review; mitigations come back normalised and without duplicates. */
export const ReviewBodySchema = z.object({
  decision: z.enum(REVIEW_DECISIONS, { error: 'decision must be approved, rejected or changes-requested' }),
  mitigations: z.array(z.string({ error: 'each mitigation must be text' }), { error: 'expected a list of mitigations' }).max(20, 'at most 20 mitigations').default([]),
  checkInMinutes: z.number({ error: 'checkInMinutes must be a number' }).int('checkInMinutes must be whole minutes')
    .min(CHECK_IN_MINUTES.min, `must be at least ${CHECK_IN_MINUTES.min} minutes`).max(CHECK_IN_MINUTES.max, `must be at most ${CHECK_IN_MINUTES.max} minutes`).optional(),
  note: z.string({ error: 'note must be text' }).trim().max(MAX_REVIEW_NOTE, `at most ${MAX_REVIEW_NOTE} characters`).default(''),
  version: z.number({ error: 'expected the shift version you reviewed' }).int().positive().optional()
}).transform((body, ctx) => {
  const mitigations: string[] = []
  body.mitigations.forEach((item, i) => {
    const normal = normaliseMitigation(item, body.checkInMinutes)
    if (typeof normal !== 'string') ctx.addIssue({ code: 'custom', path: ['mitigations', i], message: normal.message })
    else if (!mitigations.includes(normal)) mitigations.push(normal)
  })
  // a decision needs substance (docs/api.md): an approval names what makes the work acceptable
  if (body.decision === 'approved' && !body.mitigations.length) ctx.addIssue({ code: 'custom', path: ['mitigations'], message: 'an approval needs at least one mitigation' })
  if (body.decision === 'rejected' && !body.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'a rejection needs a reason' })
  if (body.decision === 'changes-requested' && !body.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'say which changes are needed' })
  return { decision: body.decision, mitigations, note: body.note, version: body.version }
})
export type ReviewInput = z.output<typeof ReviewBodySchema>

/**
 * Records a decision on a shift waiting for review: the review row (on the shift's current version,
 * with a snapshot of what was decided), the shift's review state, the audit entry and, on a
 * rejection or a send-back, the notice to the coordinators, in one transaction. A shift with no
 * review reason needs no decision: that is a 409 (the request is well formed, the shift's state does
 * not allow it, and may change).
 */
export function recordReviewDecision(db: AppDatabase, actor: { id: number }, shiftId: number, input: ReviewInput, options: { baseUrl?: string | null } = {}) {
  const result = db.transaction((tx) => {
    const shift = tx.select().from(shifts).where(eq(shifts.id, shiftId)).get()
    if (!shift) throw notFound('Shift')
    if (shift.cancelledAt) throw conflict('This shift is cancelled: there is nothing to review.', { reviewState: shift.reviewState })
    if (input.version !== undefined && input.version !== shift.version) {
      throw conflict('This shift changed since you opened it. Reload it and review what is planned now.', { currentVersion: shift.version })
    }
    if (shift.reviewState === 'not-needed') {
      throw conflict('This shift needs no review: no reason (light, cold, lone, long) holds for it.', { reviewState: shift.reviewState })
    }
    const snapshot = takeShiftSnapshot(tx, shift)
    // the decision's time from the one clock (not SQLite's), so a test clock or a replay reads true
    const row = tx.insert(reviews).values({ shiftId, reviewerId: actor.id, decision: input.decision, mitigations: input.mitigations, note: input.note, shiftVersion: shift.version, snapshot, createdAt: nowDate() }).returning().get()
    tx.update(shifts).set({ reviewState: input.decision }).where(eq(shifts.id, shiftId)).run()
    recordAudit(tx, actor.id, 'shift.review', 'shift', shiftId, {
      reviewId: row.id, decision: input.decision, mitigations: input.mitigations, note: input.note,
      shiftVersion: shift.version, previousState: shift.reviewState
    })
    const messageIds = input.decision === 'approved' ? [] : queueReviewOutcomeMail(tx, { shift, reviewId: row.id, reviewerId: actor.id, input, baseUrl: options.baseUrl ?? null })
    return { reviewId: row.id, shiftId, reviewState: input.decision, shiftVersion: shift.version, messageIds }
  })
  // sent after the commit; a failed send stays in the outbox and the timer retries it
  for (const id of result.messageIds) {
    deliverOutboxMessage(db, id).catch(err => console.error('[gloamline] review outcome mail failed', err))
  }
  const { messageIds: _sent, ...reply } = result
  return reply
}

type Tx = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]

/** What a shift is as decided: its times, site, light need, travel and people. */
export function takeShiftSnapshot(tx: Pick<AppDatabase, 'select'>, shift: Shift): ReviewShiftSnapshot {
  const site = tx.select({ name: sites.name, timezone: sites.timezone }).from(sites).where(eq(sites.id, shift.siteId)).get()!
  const names = (loadAssignees(tx, [shift.id]).get(shift.id) ?? []).map(a => a.name)
  return {
    title: shift.title,
    siteName: site.name,
    start: formatZonedIso(shift.startAt.getTime(), site.timezone),
    end: formatZonedIso(shift.endAt.getTime(), site.timezone),
    light: shift.light,
    travelMinutes: shift.travelMinutes ?? 0,
    assignees: names
  }
}

/**
 * Who hears of a rejection or a send-back: the active coordinators who created or changed the shift,
 * else every active coordinator (the shift came from an import or a person since deactivated).
 */
export function findShiftCoordinators(tx: Pick<AppDatabase, 'select'>, shift: Pick<Shift, 'id' | 'createdBy'>) {
  const actorIds = tx.select({ id: auditLog.actorId }).from(auditLog)
    .where(and(eq(auditLog.entity, 'shift'), eq(auditLog.entityId, shift.id), inArray(auditLog.action, ['shift.create', 'shift.update']))).all()
    .map(r => r.id).filter((id): id is number => id !== null)
  const ids = [...new Set([shift.createdBy, ...actorIds].filter((id): id is number => id !== null))]
  const active = and(eq(people.role, 'coordinator'), eq(people.active, true))
  const own = ids.length ? tx.select().from(people).where(and(active, inArray(people.id, ids))).all() : []
  return own.length ? own : tx.select().from(people).where(active).all()
}

function queueReviewOutcomeMail(tx: Tx, input: { shift: Shift, reviewId: number, reviewerId: number, input: ReviewInput, baseUrl: string | null }): number[] {
  const { shift } = input
  const decision = input.input.decision as 'rejected' | 'changes-requested'
  const site = tx.select().from(sites).where(eq(sites.id, shift.siteId)).get()!
  const reviewer = tx.select({ name: people.name }).from(people).where(eq(people.id, input.reviewerId)).get()
  const startIso = formatZonedIso(shift.startAt.getTime(), site.timezone)
  const date = localDateOf(Date.parse(startIso), site.timezone)
  const shiftUrl = input.baseUrl ? `${input.baseUrl}/plan?site=${site.id}&date=${date}&shift=${shift.id}` : null
  return findShiftCoordinators(tx, shift).map((person) => {
    const mail = renderReviewOutcomeMail({
      personName: person.name, decision, reviewerName: reviewer?.name ?? 'Safety review', note: input.input.note,
      mitigations: input.input.mitigations.map(describeMitigation), shiftUrl,
      shift: {
        title: shift.title, siteName: site.name, dateLabel: formatDay(startIso, site.timezone),
        span: formatTimeRange(startIso, formatZonedIso(shift.endAt.getTime(), site.timezone), site.timezone),
        reasons: (shift.reviewReasons ?? []).map(r => describeReviewReason(r, site.timezone))
      }
    })
    return enqueueOutboxMessage(tx, { ...mail, dedupeKey: `review-outcome:${input.reviewId}:${person.id}`, kind: 'review-outcome', personId: person.id, toEmail: person.email, meta: { shiftId: shift.id, reviewId: input.reviewId, decision } }).id
  })
}

/** The inputs of a shift's review assessment: where, when, its light check and how many people. */
export interface ReviewAssessmentInput {
  site: Pick<Site, 'id' | 'latitude' | 'longitude' | 'timezone'>
  /** The window the light, cold and lone checks cover: the shift, or its whole outing. */
  window: ReviewWindow
  startMs: number
  endMs: number
  lightCheck: { flagged: boolean, minutesBelow: number, requirement: Shift['light'] }
  assigneeCount: number
  nowMs?: number
  /** Read once by a caller assessing many shifts of one site (a rotation): rules, forecast, all readings. */
  preloaded?: { rules: ReturnType<typeof loadWorkRules>, forecast: SiteForecastState, readings: ObservationRow[] }
}

/** Every review reason of a shift (light, cold, lone, long), from the work rules and the site's weather. */
export function assessShiftReview(db: Pick<AppDatabase, 'select'>, input: ReviewAssessmentInput): ReviewReasonDetail[] {
  const { fromMs, toMs } = input.window
  const pre = input.preloaded
  const rules = pre?.rules ?? loadWorkRules(db)
  const forecast = pre?.forecast ?? loadSiteForecast(db, input.site.id, input.nowMs ?? clockNowMs())
  const readings = pre
    ? pre.readings.filter(r => Date.parse(r.at) >= fromMs - 3 * HOUR_MS && Date.parse(r.at) <= toMs)
    : loadSiteObservations(db, input.site.id, fromMs - 3 * HOUR_MS, toMs)
  const bands = computeLightPeriodsInRange(input.site.latitude, input.site.longitude, fromMs, toMs)
  const weather = describeWindowWeather(forecast, readings, { startMs: fromMs, endMs: toMs, bands, timezone: input.site.timezone })
  const cold = weather.figures && weather.basis !== 'none' ? { ...weather.figures, basis: weather.basis } : null
  return computeReviewReasons({
    latitude: input.site.latitude,
    longitude: input.site.longitude,
    window: input.window,
    shiftStartMs: input.startMs,
    shiftEndMs: input.endMs,
    lightCheck: input.lightCheck,
    assigneeCount: input.assigneeCount,
    // the bands of the window, already computed for the weather figures: the lone check counts from them
    bands,
    cold,
    rules
  })
}

/**
 * Re-reads the review reasons of a site's live, upcoming shifts after its weather changed (a new
 * forecast or readings): a shift that now meets the cold limit and needed no review goes to review,
 * and so does an approved one with a reason its approval did not cover. Otherwise the state stays;
 * the reasons are brought up to date.
 */
export function reassessSiteReviewReasons(db: AppDatabase, siteId: number, nowMs = clockNowMs()): number[] {
  const site = db.select().from(sites).where(eq(sites.id, siteId)).get()
  if (!site) return []
  return db.transaction((tx) => {
    const rows = tx.select().from(shifts).where(and(eq(shifts.siteId, siteId), isNull(shifts.cancelledAt), gt(shifts.endAt, new Date(nowMs)))).all()
    const counts = new Map<number, number>()
    if (rows.length) {
      for (const r of tx.select({ shiftId: shiftAssignees.shiftId }).from(shiftAssignees).where(inArray(shiftAssignees.shiftId, rows.map(r => r.id))).all()) {
        counts.set(r.shiftId, (counts.get(r.shiftId) ?? 0) + 1)
      }
    }
    const reopened: number[] = []
    for (const row of rows) {
      const reasons = assessShiftReview(tx, {
        site, window: computeOutingWindow(row.startAt.getTime(), row.endAt.getTime(), row.travelMinutes), startMs: row.startAt.getTime(), endMs: row.endAt.getTime(),
        lightCheck: { flagged: row.flagged, minutesBelow: row.minutesBelow, requirement: row.light }, assigneeCount: counts.get(row.id) ?? 0, nowMs
      })
      if (JSON.stringify(reasons) === JSON.stringify(row.reviewReasons)) continue
      // a reason the approval did not cover (the forecast turned cold) re-opens it; a drop changes nothing
      const before = new Set((row.reviewReasons ?? []).map(r => r.reason))
      const added = reasons.some(r => !before.has(r.reason))
      const reviewState = (row.reviewState === 'not-needed' && reasons.length) || (row.reviewState === 'approved' && added) ? 'pending' : row.reviewState
      tx.update(shifts).set({ reviewReasons: reasons, reviewState }).where(eq(shifts.id, row.id)).run()
      if (reviewState !== row.reviewState) recordAudit(tx, null, 'shift.review-reasons', 'shift', row.id, { before: row.reviewReasons, after: reasons, reopened: true })
      if (reviewState !== row.reviewState) reopened.push(row.id)
    }
    return reopened
  })
}

export interface ReviewHistoryEntry {
  id: number
  decision: (typeof REVIEW_DECISIONS)[number]
  mitigations: string[]
  note: string
  reviewerId: number
  reviewerName: string
  at: string
  shiftVersion: number
  /** The latest decision while the shift's review state is still that decision (isReviewDecisionCurrent). */
  current: boolean
  /** The shift as decided (null for decisions recorded before snapshots were kept). */
  snapshot: ReviewShiftSnapshot | null
}

/** Every decision on a shift, newest first. */
export function listShiftReviews(db: Pick<AppDatabase, 'select'>, shift: Pick<Shift, 'id' | 'reviewState'>): ReviewHistoryEntry[] {
  return db.select({ id: reviews.id, decision: reviews.decision, mitigations: reviews.mitigations, note: reviews.note, reviewerId: reviews.reviewerId, reviewerName: people.name, at: reviews.createdAt, shiftVersion: reviews.shiftVersion, snapshot: reviews.snapshot })
    .from(reviews).innerJoin(people, eq(people.id, reviews.reviewerId))
    .where(eq(reviews.shiftId, shift.id)).orderBy(desc(reviews.id)).all()
    .map((r, i) => ({ ...r, at: r.at.toISOString(), current: isReviewDecisionCurrent(shift.reviewState, r.decision, i === 0) }))
}

export const ReviewQueueQuerySchema = z.object({
  state: z.enum(REVIEW_QUEUE_STATES, { error: `state must be one of ${REVIEW_QUEUE_STATES.join(', ')}` }).default('pending'),
  siteId: z.coerce.number({ error: 'siteId must be a site id' }).int('siteId must be a site id').positive('siteId must be a site id').optional(),
  // 'upcoming' leaves out shifts that have already ended; 'all' keeps them
  scope: z.enum(['upcoming', 'all'], { error: 'scope must be upcoming or all' }).default('upcoming'),
  limit: z.coerce.number({ error: 'limit must be a number' }).int('limit must be a whole number').min(1, 'limit must be from 1 to 200').max(200, 'limit must be from 1 to 200').default(50)
})
export type ReviewQueueQuery = z.output<typeof ReviewQueueQuerySchema>

// Loads what shaping needs for a batch of shifts: sites, people, latest decisions, weather per site.
function shapeShiftRows(db: AppDatabase, rows: Shift[], nowMs: number): ReviewQueueItem[] {
  if (!rows.length) return []
  const siteById = new Map(db.select().from(sites).all().map(s => [s.id, s]))
  const assignees = loadAssignees(db, rows.map(r => r.id))
  const latest = loadLatestReviews(db, rows)
  const conflicts = loadShiftRowConflicts(db, rows, assignees)
  const weatherBySite = new Map<number, { forecast: SiteForecastState, readings: ObservationRow[] }>()
  for (const siteId of new Set(rows.map(r => r.siteId))) {
    const own = rows.filter(r => r.siteId === siteId)
    const from = Math.min(...own.map(r => r.startAt.getTime())) - 3 * HOUR_MS
    const to = Math.max(...own.map(r => r.endAt.getTime()))
    weatherBySite.set(siteId, { forecast: loadSiteForecast(db, siteId, nowMs), readings: loadSiteObservations(db, siteId, from, to) })
  }
  const items = rows.map((row) => {
    const site = siteById.get(row.siteId)!
    return shapeOneRow(row, site, { assigned: assignees.get(row.id) ?? [], review: latest.get(row.id) ?? null, conflicts: conflicts.get(row.id) ?? [] }, weatherBySite.get(row.siteId)!)
  })
  // the operator's weather holds over each outing, set on the shift views in place
  attachWeatherHolds(db, items.map(i => i.shift), nowMs)
  return items
}

interface RowExtras { assigned: { id: number, name: string }[], review: ShiftReviewSummary | null, conflicts: ShiftConflict[] }

function shapeOneRow(row: Shift, site: Site, extras: RowExtras, weather: { forecast: SiteForecastState, readings: ObservationRow[] }) {
  const view = toShiftView(row, site, extras.assigned, extras.review, extras.conflicts)
  const startMs = row.startAt.getTime()
  const endMs = row.endAt.getTime()
  const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: row.light })
  const windowWeather = describeWindowWeather(weather.forecast, weather.readings, { startMs, endMs, bands: check.bands, timezone: site.timezone })
  return shapeReviewQueueItem(view, check, windowWeather)
}

function queueConditions(query: Pick<ReviewQueueQuery, 'siteId' | 'scope'>, nowMs: number) {
  // every shift with a review reason, not only those below their light
  const conditions = [isNull(shifts.cancelledAt), ne(shifts.reviewState, 'not-needed')]
  if (query.siteId) conditions.push(eq(shifts.siteId, query.siteId))
  if (query.scope === 'upcoming') conditions.push(gt(shifts.endAt, new Date(nowMs)))
  return conditions
}

/** Counts per review state (same site and scope), and how many waiting shifts changed after a decision. */
export function countReviewStates(db: AppDatabase, query: Pick<ReviewQueueQuery, 'siteId' | 'scope'>, nowMs: number) {
  const grouped = db.select({ state: shifts.reviewState, n: sql<number>`count(*)` }).from(shifts)
    .where(and(...queueConditions(query, nowMs))).groupBy(shifts.reviewState).all()
  const counts = Object.fromEntries(REVIEW_QUEUE_STATES.map(s => [s, 0])) as Record<ReviewQueueState, number> & { changedSinceReview: number }
  for (const g of grouped) if (g.state !== 'not-needed') counts[g.state] = g.n
  const pending = db.select({ id: shifts.id, reviewState: shifts.reviewState }).from(shifts)
    .where(and(...queueConditions(query, nowMs), eq(shifts.reviewState, 'pending'))).all()
  counts.changedSinceReview = [...loadLatestReviews(db, pending).values()].filter(r => !r.current).length
  return counts
}

/** The review queue: flagged shifts in one review state, soonest first, shaped for the reviewer. */
export function buildReviewQueue(db: AppDatabase, query: ReviewQueueQuery, nowMs = clockNowMs()) {
  const listed = db.select().from(shifts)
    .where(and(...queueConditions(query, nowMs), eq(shifts.reviewState, query.state)))
    .orderBy(asc(shifts.startAt), asc(shifts.id)).all()
  // a rotation's shifts in this state are one item (rotation-queue.ts); the rest are listed singly
  const { groups, single: rows } = splitRotationRows(listed)
  const items = shapeShiftRows(db, rows.slice(0, query.limit), nowMs).sort(compareReviewQueueItems)
  return {
    state: query.state,
    scope: query.scope,
    generatedAt: new Date(nowMs).toISOString(),
    total: rows.length,
    counts: countReviewStates(db, query, nowMs),
    items,
    rotations: buildRotationQueueGroups(db, groups, grouped => shapeShiftRows(db, grouped, nowMs))
  }
}

/** One shift as the reviewer sees it, with every decision made on it; reviewable says whether a decision is possible now. */
export function buildReviewItem(db: AppDatabase, shiftId: number, nowMs = clockNowMs()) {
  const row = db.select().from(shifts).where(eq(shifts.id, shiftId)).get()
  if (!row) throw notFound('Shift')
  const [item] = shapeShiftRows(db, [row], nowMs)
  const reason = row.cancelledAt
    ? 'This shift is cancelled.'
    : row.reviewState === 'not-needed'
      ? 'This shift needs no review: no reason (light, cold, lone, long) holds for it.'
      : null
  const history = listShiftReviews(db, row)
  return { ...item!, reviewable: reason === null, notReviewableReason: reason, history, changes: describeChangesSinceDecision(db, row, history[0]) }
}

/** One field that changed since the last decision: its label and the old and new values in words. */
export interface ReviewChange {
  field: 'title' | 'site' | 'start' | 'end' | 'light' | 'travel' | 'people'
  label: string
  before: string
  after: string
}

const CHANGE_LABELS: Record<ReviewChange['field'], string> = {
  title: 'Task', site: 'Site', start: 'Start', end: 'End', light: 'Light needed', travel: 'Travel each way', people: 'People'
}

/** What changed between the latest decision and the shift now (empty while the decision is current). */
export function describeChangesSinceDecision(db: Pick<AppDatabase, 'select'>, row: Shift, latest: ReviewHistoryEntry | undefined): ReviewChange[] {
  if (!latest || latest.current || !latest.snapshot) return []
  const before = latest.snapshot
  const now = takeShiftSnapshot(db, row)
  const pairs: [ReviewChange['field'], string, string][] = [
    ['title', before.title, now.title],
    ['site', before.siteName, now.siteName],
    ['start', before.start, now.start],
    ['end', before.end, now.end],
    ['light', before.light, now.light],
    ['travel', `${before.travelMinutes} min`, `${now.travelMinutes} min`],
    ['people', before.assignees.join(', ') || 'nobody', now.assignees.join(', ') || 'nobody']
  ]
  return pairs.filter(([, a, b]) => a !== b).map(([field, a, b]) => ({ field, label: CHANGE_LABELS[field], before: a, after: b }))
}

/**
 * Every live shift whose latest decision is a rejection or a send-back and that has not ended yet,
 * soonest first: the coordinator's list of work to re-plan, however far ahead it lies.
 */
export function listReviewOutcomes(db: AppDatabase, nowMs = clockNowMs()) {
  const rows = db.select().from(shifts)
    .where(and(isNull(shifts.cancelledAt), inArray(shifts.reviewState, ['rejected', 'changes-requested']), gt(shifts.endAt, new Date(nowMs))))
    .orderBy(asc(shifts.startAt), asc(shifts.id)).all()
  if (!rows.length) return []
  const siteById = new Map(db.select().from(sites).all().map(s => [s.id, s]))
  const assignees = loadAssignees(db, rows.map(r => r.id))
  const latest = loadLatestReviews(db, rows)
  return rows.map(row => toShiftView(row, siteById.get(row.siteId)!, assignees.get(row.id) ?? [], latest.get(row.id) ?? null))
}
