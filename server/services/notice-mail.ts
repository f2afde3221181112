// Who hears of a committed shift change, and what they read: people on the shift when its time,
// site, light need or people change, people taken off it, everyone on it when it is cancelled, and
// every active safety officer when the change leaves flagged work waiting for review. Each notice
// goes through the outbox with a key per (kind, shift, version or review round, person), so a
// repeated announcement sends nothing twice. Explicit imports only, so unit tests can run it.
import { and, eq, inArray, sql } from 'drizzle-orm'
import { people, reviews, shifts, sites, type Person, type Shift, type Site } from '../db/schema'
import { formatDate, formatDuration } from '../../shared/format'
import { localDateOf } from '../core/time/zone-table'
import { renderShiftNoticeMail, type ShiftNoticeChange } from '../../emails/shift-notice'
import { renderReviewNeededMail } from '../../emails/review-needed'
import type { AppDatabase } from '../utils/db'
import { describeCrewShift, resolveDisplayZone } from './crew-day'
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

function queueReviewNotice(ctx: NoticeContext, person: Person, round: number): number {
  const { shift, dateLabel } = describeForPerson(ctx, person)
  const names = ctx.assignees.map(a => a.name)
  const mail = renderReviewNeededMail({
    personName: person.name, reopened: round > 0, reviewUrl: ctx.baseUrl ? `${ctx.baseUrl}/review` : null,
    shift: {
      title: ctx.row.title, siteName: ctx.site.name, dateLabel, span: shift.span, requirementWords: shift.requirementWords,
      minutesBelowText: formatDuration(ctx.row.minutesBelow), profileText: shift.profileText,
      crewText: names.length === 0 ? 'nobody assigned yet' : names.length === 1 ? `${names[0]} (alone)` : names.join(', ')
    }
  })
  // one notice per review round: a change that reopens a decided shift starts a new round
  return enqueueOutboxMessage(ctx.db, { ...mail, dedupeKey: `review-needed:${ctx.row.id}:r${round}:${person.id}`, kind: 'review-needed', personId: person.id, toEmail: person.email, meta: { shiftId: ctx.row.id, round } }).id
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
  if (row.flagged && row.reviewState === 'pending' && notice.material) {
    const round = db.select({ n: sql<number>`count(*)` }).from(reviews).where(eq(reviews.shiftId, row.id)).get()?.n ?? 0
    const officers = db.select().from(people).where(and(eq(people.role, 'safety'), eq(people.active, true))).all().filter(p => p.id !== notice.actorId)
    for (const p of officers) ids.push(queueReviewNotice(ctx, p, round))
  }
  return ids
}

/** Queues and sends at once the notices of a shift change (failures stay in the outbox for retry). */
export async function sendShiftChangeNotices(db: AppDatabase, notice: ShiftChangeNotice, options: { baseUrl: string | null, send?: MailSender }): Promise<DeliveryOutcome[]> {
  const ids = queueShiftChangeNotices(db, notice, options)
  const outcomes: DeliveryOutcome[] = []
  for (const id of ids) outcomes.push(await deliverOutboxMessage(db, id, { send: options.send }))
  return outcomes
}
