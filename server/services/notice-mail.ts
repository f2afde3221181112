// Who hears of a committed shift change, and what they read: people on the shift when its time,
// site, light need or people change, people taken off it, everyone on it when it is cancelled, and
// every active safety officer (one digest per officer per run) when work waits for review. Each notice
// goes through the outbox with a key per (kind, shift, version or review round, person), so a
// repeated announcement sends nothing twice. Explicit imports only, so unit tests can run it.
import { and, eq, gt, inArray, isNull, sql } from 'drizzle-orm'
import { messages, people, reviews, shifts, sites, type Person, type Shift, type Site } from '../db/schema'
import { formatDate } from '../../shared/format'
import { localDateOf } from '../core/time/zone-table'
import { renderShiftNoticeMail, type ShiftNoticeChange } from '../../emails/shift-notice'
import { renderReviewDigestMail, type ReviewDigestItem } from '../../emails/review-digest'
import { describeReviewReason } from '../../shared/review'
import { createHash } from 'node:crypto'
import type { AppDatabase } from '../utils/db'
import { describeCrewShift, describeCrewSpan, resolveDisplayZone } from './crew-day'
import { deliverOutboxMessage, enqueueOutboxMessage, type DeliveryOutcome } from './outbox'
import type { MailSender } from '../adapters/mail'
import { loadAssignees, loadLatestReviews } from './shifts'
import type { ShiftChangeNotice } from './shift-notices'
import { nowMs as clockNowMs } from '../core/time/clock'

const NO_FORECAST = { state: 'none' as const, latest: null, lastAttempt: null }

interface NoticeContext {
  db: AppDatabase
  row: Shift
  site: Site
  assignees: { id: number, name: string }[]
  actorName: string
  baseUrl: string | null
}

function describeForPerson(ctx: NoticeContext, person: Person) {
  const zone = resolveDisplayZone(person.displayZone, ctx.site.timezone)
  const review = loadLatestReviews(ctx.db, [ctx.row]).get(ctx.row.id) ?? null
  const shift = describeCrewShift({ row: ctx.row, site: ctx.site, zone, personId: person.id, assignees: ctx.assignees, review, forecast: NO_FORECAST, observations: [] })
  return { shift, dateLabel: formatDate(localDateOf(ctx.row.startAt.getTime(), zone)) }
}

function queueAssigneeNotice(ctx: NoticeContext, person: Person, change: ShiftNoticeChange): number {
  const { shift, dateLabel } = describeForPerson(ctx, person)
  const mail = renderShiftNoticeMail({
    personName: person.name, change, actorName: ctx.actorName, homeUrl: ctx.baseUrl ? `${ctx.baseUrl}/` : null,
    shift: { title: ctx.row.title, siteName: ctx.site.name, dateLabel, span: shift.span, requirementWords: shift.requirementWords, lightState: shift.lightState, reviewWords: shift.reviewWords, mitigations: shift.mitigations, crewmates: shift.crewmates }
  })
  const key = change === 'cancelled' ? `shift-cancelled:${ctx.row.id}:${person.id}` : `shift-${change}:${ctx.row.id}:v${ctx.row.version}:${person.id}`
  return enqueueOutboxMessage(ctx.db, { ...mail, dedupeKey: key, kind: `shift-${change}`, personId: person.id, toEmail: person.email, meta: { shiftId: ctx.row.id, version: ctx.row.version } }).id
}

function loadActivePeople(db: AppDatabase, ids: number[]): Person[] {
  if (!ids.length) return []
  return db.select().from(people).where(and(inArray(people.id, ids), eq(people.active, true))).all()
}

/** Queues the mail a committed shift change calls for; returns the outbox ids (new or already there). */
export function queueShiftChangeNotices(db: AppDatabase, notice: ShiftChangeNotice, options: { baseUrl: string | null, nowMs?: number }): number[] {
  const row = db.select().from(shifts).where(eq(shifts.id, notice.shiftId)).get()
  if (!row || row.endAt.getTime() <= (options.nowMs ?? clockNowMs())) return []
  const site = db.select().from(sites).where(eq(sites.id, row.siteId)).get()!
  const assignees = loadAssignees(db, [row.id]).get(row.id) ?? []
  const actor = db.select({ name: people.name }).from(people).where(eq(people.id, notice.actorId)).get()
  const ctx: NoticeContext = { db, row, site, assignees, actorName: actor?.name ?? 'a coordinator', baseUrl: options.baseUrl }
  const currentIds = assignees.map(a => a.id).filter(id => id !== notice.actorId)
  const removedIds = notice.previousAssigneeIds.filter(id => id !== notice.actorId && !assignees.some(a => a.id === id))
  const ids: number[] = []
  if (notice.kind === 'cancelled' || row.cancelledAt) {
    for (const p of loadActivePeople(db, [...new Set([...currentIds, ...removedIds])])) ids.push(queueAssigneeNotice(ctx, p, 'cancelled'))
    return ids
  }
  if (notice.kind === 'updated' && notice.material) {
    for (const p of loadActivePeople(db, currentIds)) ids.push(queueAssigneeNotice(ctx, p, 'changed'))
    for (const p of loadActivePeople(db, removedIds)) ids.push(queueAssigneeNotice(ctx, p, 'removed'))
  }
  // work waiting for review: one digest per officer with everything new since their last one
  if (row.reviewState === 'pending' && notice.material) ids.push(...queueReviewDigests(db, { baseUrl: options.baseUrl, nowMs: options.nowMs }))
  return ids
}

/** Queues and sends at once the notices of a shift change (failures stay in the outbox for retry). */
export async function sendShiftChangeNotices(db: AppDatabase, notice: ShiftChangeNotice, options: { baseUrl: string | null, send?: MailSender }): Promise<DeliveryOutcome[]> {
  const ids = queueShiftChangeNotices(db, notice, options)
  const outcomes: DeliveryOutcome[] = []
  for (const id of ids) outcomes.push(await deliverOutboxMessage(db, id, { send: options.send }))
  return outcomes
}

export const REVIEW_DIGEST_KIND = 'review-digest'

interface DigestEntry { key: string, row: Shift, round: number }

// Each waiting shift is an item per review round: a change that re-opens a decided shift is new again.
function listWaitingItems(db: AppDatabase, nowMs: number): DigestEntry[] {
  const rows = db.select().from(shifts).where(and(eq(shifts.reviewState, 'pending'), isNull(shifts.cancelledAt), gt(shifts.endAt, new Date(nowMs)))).orderBy(shifts.startAt).all()
  if (!rows.length) return []
  const rounds = new Map(db.select({ shiftId: reviews.shiftId, n: sql<number>`count(*)` }).from(reviews)
    .where(inArray(reviews.shiftId, db.select({ id: shifts.id }).from(shifts).where(and(eq(shifts.reviewState, 'pending'), isNull(shifts.cancelledAt)))))
    .groupBy(reviews.shiftId).all().map(r => [r.shiftId, r.n]))
  return rows.map(row => ({ key: `${row.id}:r${rounds.get(row.id) ?? 0}`, row, round: rounds.get(row.id) ?? 0 }))
}

// Items already in an officer's earlier digests (read from the outbox, so it holds across restarts).
function loadAnnouncedItems(db: AppDatabase, personId: number): Set<string> {
  const out = new Set<string>()
  for (const m of db.select({ meta: messages.meta }).from(messages).where(and(eq(messages.kind, REVIEW_DIGEST_KIND), eq(messages.personId, personId))).all()) {
    for (const key of (m.meta?.items as string[] | undefined) ?? []) out.add(key)
  }
  return out
}

function describeDigestItem(db: AppDatabase, entry: DigestEntry, person: Person, siteById: Map<number, Site>, baseUrl: string | null): ReviewDigestItem {
  const site = siteById.get(entry.row.siteId)!
  const zone = resolveDisplayZone(person.displayZone, site.timezone)
  const names = (loadAssignees(db, [entry.row.id]).get(entry.row.id) ?? []).map(a => a.name)
  const startMs = entry.row.startAt.getTime()
  return {
    title: entry.row.title, siteName: site.name, dateLabel: formatDate(localDateOf(startMs, zone)),
    span: describeCrewSpan(startMs, entry.row.endAt.getTime(), zone),
    reasons: (entry.row.reviewReasons ?? []).map(r => describeReviewReason(r, zone)),
    crewText: names.length === 0 ? 'nobody assigned yet' : names.length === 1 ? `${names[0]} (alone)` : names.join(', '),
    reopened: entry.round > 0,
    reviewUrl: baseUrl ? `${baseUrl}/review/${entry.row.id}` : null
  }
}

/**
 * Queues one review digest per active safety officer listing every shift waiting for review that
 * no earlier digest of theirs listed (in this review round); nothing for an officer with nothing new.
 */
export function queueReviewDigests(db: AppDatabase, options: { baseUrl: string | null, nowMs?: number }): number[] {
  const waiting = listWaitingItems(db, options.nowMs ?? clockNowMs())
  if (!waiting.length) return []
  const siteById = new Map(db.select().from(sites).all().map(s => [s.id, s]))
  const officers = db.select().from(people).where(and(eq(people.role, 'safety'), eq(people.active, true))).all()
  const ids: number[] = []
  for (const person of officers) {
    const announced = loadAnnouncedItems(db, person.id)
    const fresh = waiting.filter(w => !announced.has(w.key))
    if (!fresh.length) continue
    const keys = fresh.map(f => f.key)
    const mail = renderReviewDigestMail({
      personName: person.name,
      items: fresh.map(f => describeDigestItem(db, f, person, siteById, options.baseUrl)),
      queueUrl: options.baseUrl ? `${options.baseUrl}/review` : null
    })
    const digest = createHash('sha256').update(keys.join(',')).digest('hex').slice(0, 32)
    ids.push(enqueueOutboxMessage(db, { ...mail, dedupeKey: `${REVIEW_DIGEST_KIND}:${person.id}:${digest}`, kind: REVIEW_DIGEST_KIND, personId: person.id, toEmail: person.email, meta: { items: keys, shiftIds: fresh.map(f => f.row.id) } }).id)
  }
  return ids
}
