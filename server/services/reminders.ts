// Evening-before reminders. For a local date D (each site in its own zone), every active person with
// reminders on who is assigned to a shift starting on D gets one message: their shifts that day at
// every site, with the light window there. Its outbox key is (kind, person, date, shift set): a run
// that finds the key sends nothing new; a shift added to or taken from their day makes a new key and
// an updated reminder. Explicit imports only, so unit tests can run it on a fresh database.
import { and, eq, gt, gte, inArray, isNull, like, lt, ne } from 'drizzle-orm'
import { messages, people, shiftAssignees, shifts, sites, unavailability, type Person, type Shift, type Site } from '../db/schema'
import { addDays, formatDate } from '../../shared/format'
import { renderReminderMail, type ReminderSiteProps } from '../../emails/reminder'
import { addFieldReminderNotes, buildFieldReminderNotes } from './holds'
import type { AppDatabase } from '../utils/db'
import { buildCrewSiteView, type CrewSiteView } from './crew-day'
import { deliverOutboxMessage, enqueueOutboxMessage, hasOutboxMessage, type DeliveryOutcome } from './outbox'
import type { MailSender } from '../adapters/mail'
import { localMidnightMs, wallClockOf } from '../core/time/zone-table'
import { nowMs as clockNowMs } from '../core/time/clock'

export const REMINDER_KIND = 'reminder'

export interface ReminderPlan {
  person: Person
  date: string
  shifts: Shift[]
  dedupeKey: string
}

/** The outbox key of a reminder: kind, person, local date and the set of shift ids. */
export function composeReminderKey(personId: number, date: string, shiftIds: number[]): string {
  return `${REMINDER_KIND}:${personId}:${date}:${[...shiftIds].sort((a, b) => a - b).join(',')}`
}

/** Shifts (not cancelled) that start on a local date, read in each site's own zone. */
export function findShiftsStartingOn(db: AppDatabase, date: string, siteIds?: number[]): Shift[] {
  const siteRows = siteIds ? db.select().from(sites).where(inArray(sites.id, siteIds)).all() : db.select().from(sites).all()
  return siteRows.flatMap((site) => {
    const from = new Date(localMidnightMs(date, site.timezone))
    const to = new Date(localMidnightMs(addDays(date, 1), site.timezone))
    return db.select().from(shifts)
      .where(and(eq(shifts.siteId, site.id), isNull(shifts.cancelledAt), gte(shifts.startAt, from), lt(shifts.startAt, to))).all()
  }).sort((a, b) => a.startAt.getTime() - b.startAt.getTime())
}

// The people's blocked spans (days away) overlapping the day's shifts: personId → spans.
function loadAwaySpans(db: AppDatabase, personIds: number[], dayShifts: Shift[]) {
  const map = new Map<number, { startMs: number, endMs: number }[]>()
  if (!personIds.length || !dayShifts.length) return map
  const from = new Date(Math.min(...dayShifts.map(s => s.startAt.getTime())))
  const to = new Date(Math.max(...dayShifts.map(s => s.endAt.getTime())))
  const rows = db.select().from(unavailability)
    .where(and(inArray(unavailability.personId, personIds), lt(unavailability.startAt, to), gt(unavailability.endAt, from))).all()
  for (const r of rows) map.set(r.personId, [...(map.get(r.personId) ?? []), { startMs: r.startAt.getTime(), endMs: r.endAt.getTime() }])
  return map
}

/**
 * Who gets a reminder for a date, with which shifts. With siteIds, only people working at those
 * sites that day are planned, but each plan still holds all of their shifts that day.
 */
export function planRemindersForDate(db: AppDatabase, date: string, siteIds?: number[]): ReminderPlan[] {
  const dayShifts = findShiftsStartingOn(db, date)
  if (!dayShifts.length) return []
  const links = db.select().from(shiftAssignees).where(inArray(shiftAssignees.shiftId, dayShifts.map(s => s.id))).all()
  const wanted = new Set(siteIds ?? dayShifts.map(s => s.siteId))
  const shiftById = new Map(dayShifts.map(s => [s.id, s]))
  const candidates = [...new Set(links.filter(l => wanted.has(shiftById.get(l.shiftId)!.siteId)).map(l => l.personId))]
  if (!candidates.length) return []
  const persons = db.select().from(people).where(and(inArray(people.id, candidates), eq(people.active, true), eq(people.remindersEnabled, true))).all()
  const away = loadAwaySpans(db, persons.map(p => p.id), dayShifts)
  return persons.flatMap((person) => {
    // no reminder for work on a day the person is away (leave, travel): the coordinator sees the
    // conflict on the shift; the person is not told to turn up
    const own = links.filter(l => l.personId === person.id).map(l => shiftById.get(l.shiftId)!)
      .filter(s => !(away.get(person.id) ?? []).some(b => b.startMs < s.endAt.getTime() && b.endMs > s.startAt.getTime()))
    return own.length ? [{ person, date, shifts: own, dedupeKey: composeReminderKey(person.id, date, own.map(s => s.id)) }] : []
  }).sort((a, b) => a.person.id - b.person.id)
}

function toReminderSite(view: CrewSiteView): ReminderSiteProps {
  const day = view.days[0]!
  return {
    name: view.name,
    zoneNote: view.zoneNote,
    statusWords: day.statusWords,
    lightRows: day.rows.map(r => ({ label: r.label, value: r.value, note: r.note ?? undefined })),
    weather: day.weather,
    forecastNote: view.forecastNote,
    shifts: day.shifts.map(s => ({
      title: s.title, span: s.span, requirementWords: s.requirementWords, lightState: s.lightState, profileText: s.profileText,
      reviewWords: s.reviewWords, reviewNote: s.reviewNote, mitigations: s.mitigations, crewmates: s.crewmates,
      notes: s.notes, weather: s.weather, cautions: s.cautions
    }))
  }
}

/** Renders the reminder of a plan: one block per site, in the order of the person's first shift there. */
export function composeReminderForPlan(db: AppDatabase, plan: ReminderPlan, options: { baseUrl: string | null, nowMs: number }) {
  const siteIds = [...new Set(plan.shifts.map(s => s.siteId))]
  const siteRows = db.select().from(sites).where(inArray(sites.id, siteIds)).all()
  const byId = new Map<number, Site>(siteRows.map(s => [s.id, s]))
  const views = siteIds.map(id => buildCrewSiteView(db, {
    site: byId.get(id)!, dates: [{ date: plan.date, which: 'tomorrow' }], person: plan.person, shifts: plan.shifts, match: 'starts', nowMs: options.nowMs
  }))
  const fieldNotes = buildFieldReminderNotes(db, plan.shifts, byId, plan.person.units ?? 'metric', options.nowMs)
  const earlier = db.select({ id: messages.id }).from(messages)
    .where(and(eq(messages.kind, REMINDER_KIND), like(messages.dedupeKey, `${REMINDER_KIND}:${plan.person.id}:${plan.date}:%`), ne(messages.dedupeKey, plan.dedupeKey))).get()
  return renderReminderMail({
    personName: plan.person.name,
    dateLabel: formatDate(plan.date),
    // when to leave and be back, and the operator's weather hold, per shift
    sites: views.map(v => addFieldReminderNotes(toReminderSite(v), v.days[0]!.shifts.map(s => s.id), fieldNotes)),
    updated: Boolean(earlier),
    homeUrl: options.baseUrl ? `${options.baseUrl}/` : null,
    settingsUrl: options.baseUrl ? `${options.baseUrl}/settings` : null
  })
}

/** Queues the reminders for a date that are not in the outbox yet; returns the ids of the new ones. */
export function queueRemindersForDate(db: AppDatabase, date: string, options: { siteIds?: number[], baseUrl: string | null, nowMs?: number }): number[] {
  const nowMs = options.nowMs ?? clockNowMs()
  const created: number[] = []
  for (const plan of planRemindersForDate(db, date, options.siteIds)) {
    if (hasOutboxMessage(db, plan.dedupeKey)) continue
    const content = composeReminderForPlan(db, plan, { baseUrl: options.baseUrl, nowMs })
    const { id, created: isNew } = enqueueOutboxMessage(db, {
      ...content,
      dedupeKey: plan.dedupeKey,
      kind: REMINDER_KIND,
      personId: plan.person.id,
      toEmail: plan.person.email,
      meta: { date, shiftIds: plan.shifts.map(s => s.id), siteIds: [...new Set(plan.shifts.map(s => s.siteId))] }
    })
    if (isNew) created.push(id)
  }
  return created
}

/** Ids of the reminders for a date that are not sent yet (queued, or failed and waiting for a retry). */
export function findUnsentReminderIds(db: AppDatabase, date: string): number[] {
  return db.select({ id: messages.id }).from(messages)
    .where(and(eq(messages.kind, REMINDER_KIND), like(messages.dedupeKey, `${REMINDER_KIND}:%:${date}:%`), ne(messages.status, 'sent')))
    .orderBy(messages.id).all().map(r => r.id)
}

/**
 * Sends now the reminders for a date: queues the missing ones, then sends every unsent one of that
 * date (a coordinator asked, so back-off is skipped). `sent` counts the messages delivered by this run.
 */
export async function runRemindersForDate(db: AppDatabase, date: string, options: { baseUrl: string | null, send?: MailSender }) {
  queueRemindersForDate(db, date, { baseUrl: options.baseUrl })
  const outcomes: DeliveryOutcome[] = []
  for (const id of findUnsentReminderIds(db, date)) outcomes.push(await deliverOutboxMessage(db, id, { force: true, send: options.send }))
  return {
    sent: outcomes.filter(o => o.status === 'sent').length,
    pending: findUnsentReminderIds(db, date).length
  }
}

/** The (site, date) pairs whose reminders are due at an instant: the site's local hour has reached its reminderHour, for the next local day. */
export function findDueReminderTargets(db: AppDatabase, nowMs: number): { siteId: number, date: string }[] {
  return db.select().from(sites).where(isNull(sites.archivedAt)).all().flatMap((site) => {
    const wall = wallClockOf(nowMs, site.timezone)
    const hour = Number(wall.slice(11, 13))
    return hour >= site.reminderHour ? [{ siteId: site.id, date: addDays(wall.slice(0, 10), 1) }] : []
  })
}

/** Queues every reminder that is due now (grouped by date); the outbox sends them. */
export function queueDueReminders(db: AppDatabase, nowMs: number, baseUrl: string | null): number[] {
  const byDate = new Map<string, number[]>()
  for (const t of findDueReminderTargets(db, nowMs)) byDate.set(t.date, [...(byDate.get(t.date) ?? []), t.siteId])
  return [...byDate].flatMap(([date, siteIds]) => queueRemindersForDate(db, date, { siteIds, baseUrl, nowMs }))
}
