// The field day in the database: departures, check-ins and returns, the field board, the operator's
// field settings, and the alerts to safety officers and coordinators. Explicit imports, so unit tests
// and the timer can call it on any database handle.
import { and, desc, eq, gt, inArray, isNull, or } from 'drizzle-orm'
import { z } from 'zod'
import type { User } from '#auth-utils'
import { fieldCheckIns, fieldOutings, people, settings, shiftAssignees, shifts, sites } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { conflict, fieldError, notFound } from '../utils/errors'
import { recordAudit } from './audit'
import { enqueueOutboxMessage } from './outbox'
import { assessParty, fieldAlertKey, type PartyAssessment } from '../core/field/status'
import { formatZonedIso } from '../core/time/zoned'
import { DEFAULT_FIELD_SETTINGS, FIELD_STATE_WORDS, type FieldParty, type FieldSettings } from '../../shared/field'
import { formatDay, formatDuration, formatLocalTime } from '../../shared/format'
import { renderFieldAlertMail } from '../../emails/field-alert'
import type { ShiftReply } from '../../shared/types/shift'
import { attachWeatherHolds } from './holds'

const MINUTE_MS = 60_000
/** Parties back within this long stay on the board (docs/api.md: 12 h). */
export const FIELD_BOARD_BACK_HOURS = 12
export const FIELD_SETTINGS_KEY = 'field'

type Reader = Pick<AppDatabase, 'select'>
type Actor = Pick<User, 'id' | 'role'>

const minutes = (label: string, min: number, max: number) => z.number({ error: `expected ${label} in minutes` })
  .int('must be whole minutes').min(min, `must be between ${min} and ${max}`).max(max, `must be between ${min} and ${max}`)

export const FieldSettingsPatchSchema = z.object({
  overdueGraceMinutes: minutes('a grace period', 0, 24 * 60).optional(),
  soloCheckInMinutes: minutes('a check-in interval', 5, 24 * 60).optional(),
  escalateEveryMinutes: minutes('an escalation interval', 5, 24 * 60).optional()
}).strict()

export const DepartureBodySchema = z.object({
  expectedBackAt: z.iso.datetime({ offset: true, error: 'expected an ISO 8601 instant with an offset' }).optional()
}).strict()

export const CheckInBodySchema = z.object({
  note: z.string({ error: 'expected text' }).trim().max(1000, 'must be at most 1000 characters').optional()
}).strict()

/** The operator's field settings over the defaults. */
export function loadFieldSettings(db: Reader): FieldSettings {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, FIELD_SETTINGS_KEY)).get()
  const stored = FieldSettingsPatchSchema.safeParse(row?.value ?? {})
  return { ...DEFAULT_FIELD_SETTINGS, ...(stored.success ? stored.data : {}) }
}

/** Changes the field settings and records who did, in one transaction. */
export function saveFieldSettings(db: AppDatabase, actorId: number, patch: z.infer<typeof FieldSettingsPatchSchema>): FieldSettings {
  return db.transaction((tx) => {
    const before = loadFieldSettings(tx)
    const next = { ...before, ...patch }
    tx.insert(settings).values({ key: FIELD_SETTINGS_KEY, value: next }).onConflictDoUpdate({ target: settings.key, set: { value: next } }).run()
    recordAudit(tx, actorId, 'settings.field', 'settings', null, { before, after: next })
    return next
  })
}

// The shift, if this person may act on it: coordinator and safety on any, crew on their own. Another's
// shift is a 404 for crew, as GET /api/shifts/:id answers.
function requireFieldShift(db: Reader, actor: Actor, shiftId: number) {
  const shift = db.select().from(shifts).where(eq(shifts.id, shiftId)).get()
  if (!shift) throw notFound('Shift')
  if (actor.role === 'crew') {
    const mine = db.select({ id: shiftAssignees.personId }).from(shiftAssignees)
      .where(and(eq(shiftAssignees.shiftId, shiftId), eq(shiftAssignees.personId, actor.id))).get()
    if (!mine) throw notFound('Shift')
  }
  return shift
}

function findOpenOuting(db: Reader, shiftId: number) {
  return db.select().from(fieldOutings).where(and(eq(fieldOutings.shiftId, shiftId), isNull(fieldOutings.returnedAt))).orderBy(desc(fieldOutings.id)).get()
}

/** Records that the party of a shift went out; expectedBackAt defaults to end + travel. */
export function recordDeparture(db: AppDatabase, actor: Actor, shiftId: number, body: z.infer<typeof DepartureBodySchema>, nowMs: number): FieldParty {
  const outingId = db.transaction((tx) => {
    const shift = requireFieldShift(tx, actor, shiftId)
    if (shift.cancelledAt) throw conflict('This shift was cancelled; nobody can leave for it.')
    if (findOpenOuting(tx, shiftId)) throw conflict('This party is already out. Record their return first.')
    const expected = body.expectedBackAt ? Date.parse(body.expectedBackAt) : shift.endAt.getTime() + shift.travelMinutes * MINUTE_MS
    if (expected <= nowMs) throw fieldError('expectedBackAt', 'must be later than now')
    const row = tx.insert(fieldOutings).values({ shiftId, departedAt: new Date(nowMs), expectedBackAt: new Date(expected), departedBy: actor.id }).returning().get()
    recordAudit(tx, actor.id, 'field.departure', 'shift', shiftId, { outingId: row.id, expectedBackAt: new Date(expected).toISOString() })
    return row.id
  })
  return findFieldParty(db, outingId, nowMs)!
}

/** Records a call from the field on the party's open outing. */
export function recordCheckIn(db: AppDatabase, actor: Actor, shiftId: number, body: z.infer<typeof CheckInBodySchema>, nowMs: number): FieldParty {
  const outingId = db.transaction((tx) => {
    requireFieldShift(tx, actor, shiftId)
    const open = findOpenOuting(tx, shiftId)
    if (!open) throw conflict('This party is not out: record the departure first.')
    tx.insert(fieldCheckIns).values({ outingId: open.id, at: new Date(nowMs), personId: actor.id, note: body.note ?? '' }).run()
    recordAudit(tx, actor.id, 'field.check-in', 'shift', shiftId, { outingId: open.id, note: body.note ?? '' })
    return open.id
  })
  return findFieldParty(db, outingId, nowMs)!
}

/** Records that the party is back; their alerts stop. */
export function recordReturn(db: AppDatabase, actor: Actor, shiftId: number, nowMs: number): FieldParty {
  const outingId = db.transaction((tx) => {
    requireFieldShift(tx, actor, shiftId)
    const open = findOpenOuting(tx, shiftId)
    if (!open) throw conflict('This party is not out: there is no departure to close.')
    tx.update(fieldOutings).set({ returnedAt: new Date(nowMs), returnedBy: actor.id }).where(eq(fieldOutings.id, open.id)).run()
    recordAudit(tx, actor.id, 'field.return', 'shift', shiftId, { outingId: open.id })
    return open.id
  })
  return findFieldParty(db, outingId, nowMs)!
}

/** The latest outing of a shift for the crew's buttons (null when never out), and the planned times. */
export function findShiftFieldStatus(db: AppDatabase, actor: Actor, shiftId: number, nowMs: number) {
  const shift = requireFieldShift(db, actor, shiftId)
  const site = db.select().from(sites).where(eq(sites.id, shift.siteId)).get()!
  const latest = db.select({ id: fieldOutings.id }).from(fieldOutings).where(eq(fieldOutings.shiftId, shiftId)).orderBy(desc(fieldOutings.id)).get()
  const count = db.select({ id: shiftAssignees.personId }).from(shiftAssignees).where(eq(shiftAssignees.shiftId, shiftId)).all().length
  const settingsNow = loadFieldSettings(db)
  const party = latest ? findFieldParty(db, latest.id, nowMs) ?? null : null
  const travelMs = shift.travelMinutes * MINUTE_MS
  // the crew's leave button shows from six hours before the planned departure until the planned return
  const inWindow = nowMs >= shift.startAt.getTime() - travelMs - 6 * 3_600_000 && nowMs < shift.endAt.getTime() + travelMs
  const start = formatZonedIso(shift.startAt.getTime(), site.timezone)
  const end = formatZonedIso(shift.endAt.getTime(), site.timezone)
  const [held] = attachWeatherHolds(db, [{ siteId: site.id, start, end, timezone: site.timezone, travelMinutes: shift.travelMinutes, weatherHold: null as ShiftReply['weatherHold'] }], nowMs)
  return {
    shiftId,
    timezone: site.timezone,
    start,
    end,
    travelMinutes: shift.travelMinutes,
    weatherHold: held!.weatherHold ?? null,
    alone: count === 1,
    soloCheckInMinutes: settingsNow.soloCheckInMinutes,
    cancelled: shift.cancelledAt !== null,
    canDepart: shift.cancelledAt === null && inWindow && (!party || party.state === 'back'),
    party
  }
}

interface OutingRow {
  outing: typeof fieldOutings.$inferSelect
  shift: typeof shifts.$inferSelect
  site: typeof sites.$inferSelect
}

// Outings with their shift and site, the last check-in and the people, in three queries.
function loadOutings(db: Reader, where: ReturnType<typeof and>) {
  const rows: OutingRow[] = db.select({ outing: fieldOutings, shift: shifts, site: sites }).from(fieldOutings)
    .innerJoin(shifts, eq(shifts.id, fieldOutings.shiftId)).innerJoin(sites, eq(sites.id, shifts.siteId))
    .where(where).orderBy(fieldOutings.departedAt).all()
  const ids = rows.map(r => r.outing.id)
  const lastCheckIn = new Map<number, number>()
  if (ids.length) {
    for (const c of db.select({ outingId: fieldCheckIns.outingId, at: fieldCheckIns.at }).from(fieldCheckIns).where(inArray(fieldCheckIns.outingId, ids)).all()) {
      lastCheckIn.set(c.outingId, Math.max(lastCheckIn.get(c.outingId) ?? 0, c.at.getTime()))
    }
  }
  const shiftIds = [...new Set(rows.map(r => r.shift.id))]
  const crew = new Map<number, { id: number, name: string, email: string }[]>()
  if (shiftIds.length) {
    for (const p of db.select({ shiftId: shiftAssignees.shiftId, id: people.id, name: people.name, email: people.email }).from(shiftAssignees)
      .innerJoin(people, eq(people.id, shiftAssignees.personId)).where(inArray(shiftAssignees.shiftId, shiftIds)).all()) {
      crew.set(p.shiftId, [...(crew.get(p.shiftId) ?? []), { id: p.id, name: p.name, email: p.email }])
    }
  }
  return rows.map(r => ({ ...r, lastCheckInMs: lastCheckIn.get(r.outing.id) ?? null, people: crew.get(r.shift.id) ?? [] }))
}

type LoadedOuting = ReturnType<typeof loadOutings>[number]

function assess(row: LoadedOuting, fieldSettings: FieldSettings, nowMs: number): PartyAssessment {
  return assessParty({
    departedAtMs: row.outing.departedAt.getTime(),
    expectedBackAtMs: row.outing.expectedBackAt.getTime(),
    lastCheckInAtMs: row.lastCheckInMs,
    returnedAtMs: row.outing.returnedAt?.getTime() ?? null,
    peopleCount: row.people.length
  }, fieldSettings, nowMs)
}

/** The state in words: "Overdue by 40 min (expected back 14:30)". */
export function describeFieldState(row: LoadedOuting, a: PartyAssessment, nowMs: number): string {
  const zone = row.site.timezone
  const expected = formatLocalTime(row.outing.expectedBackAt.getTime(), zone)
  const since = (ms: number) => formatDuration(Math.max(0, Math.floor((nowMs - ms) / MINUTE_MS)))
  if (a.state === 'back') return `${FIELD_STATE_WORDS.back} at ${formatLocalTime(row.outing.returnedAt!.getTime(), zone)}`
  if (a.state === 'overdue') return `Overdue by ${since(row.outing.expectedBackAt.getTime())}: expected back ${expected}, no return recorded`
  if (a.state === 'check-in-missed') return `Check-in missed: alone, no word for ${since(row.lastCheckInMs ?? row.outing.departedAt.getTime())}`
  return `Out, expected back ${expected}`
}

function toFieldParty(row: LoadedOuting, fieldSettings: FieldSettings, nowMs: number): FieldParty {
  const zone = row.site.timezone
  const a = assess(row, fieldSettings, nowMs)
  return {
    shiftId: row.shift.id,
    outingId: row.outing.id,
    title: row.shift.title,
    siteName: row.site.name,
    timezone: zone,
    people: row.people.map(p => ({ id: p.id, name: p.name })),
    departedAt: formatZonedIso(row.outing.departedAt.getTime(), zone),
    expectedBackAt: formatZonedIso(row.outing.expectedBackAt.getTime(), zone),
    lastCheckInAt: row.lastCheckInMs === null ? null : formatZonedIso(row.lastCheckInMs, zone),
    returnedAt: row.outing.returnedAt ? formatZonedIso(row.outing.returnedAt.getTime(), zone) : null,
    state: a.state,
    alertSince: a.alertSinceMs === null ? null : formatZonedIso(a.alertSinceMs, zone),
    words: describeFieldState(row, a, nowMs)
  }
}

/** One outing as the board shows it. */
export function findFieldParty(db: Reader, outingId: number, nowMs: number): FieldParty | undefined {
  const row = loadOutings(db, and(eq(fieldOutings.id, outingId)))[0]
  return row ? toFieldParty(row, loadFieldSettings(db), nowMs) : undefined
}

// Alerts first, then those out, then those back; within each, the longest standing first.
const STATE_ORDER = { 'overdue': 0, 'check-in-missed': 1, 'out': 2, 'back': 3 } as const

/** The field board: everyone out now, and parties back within the last 12 hours. */
export function listFieldBoard(db: Reader, nowMs: number): { out: FieldParty[] } {
  const backSince = new Date(nowMs - FIELD_BOARD_BACK_HOURS * 3_600_000)
  const fieldSettings = loadFieldSettings(db)
  const parties = loadOutings(db, and(or(isNull(fieldOutings.returnedAt), gt(fieldOutings.returnedAt, backSince))))
    .map(row => toFieldParty(row, fieldSettings, nowMs))
  return { out: parties.sort((a, b) => STATE_ORDER[a.state] - STATE_ORDER[b.state] || Date.parse(a.departedAt) - Date.parse(b.departedAt)) }
}

function formatWhen(ms: number, zone: string) {
  const offset = formatZonedIso(ms, zone).slice(19)
  return `${formatDay(ms, zone)} ${formatLocalTime(ms, zone)} (${zone}, UTC${offset === 'Z' ? '+00:00' : offset})`
}

/**
 * Queues the alert of the current step for every party overdue or with a missed check-in, to every
 * active safety officer and coordinator. The outbox's unique key per outing, alert, step and person
 * makes this safe to run from any number of processes, any number of times: a step goes once.
 * Returns how many messages were new.
 */
export function queueFieldAlerts(db: AppDatabase, nowMs: number, baseUrl: string | null): number {
  const open = loadOutings(db, and(isNull(fieldOutings.returnedAt)))
  if (!open.length) return 0
  const fieldSettings = loadFieldSettings(db)
  const recipients = db.select({ id: people.id, name: people.name, email: people.email }).from(people)
    .where(and(eq(people.active, true), inArray(people.role, ['safety', 'coordinator']))).all()
  let created = 0
  for (const row of open) {
    const a = assess(row, fieldSettings, nowMs)
    if (!a.alert) continue
    const zone = row.site.timezone
    for (const person of recipients) {
      const content = renderFieldAlertMail({
        personName: person.name,
        kind: a.alert,
        step: a.step,
        party: {
          title: row.shift.title,
          siteName: row.site.name,
          people: row.people.map(p => p.name).join(', ') || 'Nobody assigned',
          departedText: formatWhen(row.outing.departedAt.getTime(), zone),
          expectedBackText: formatWhen(row.outing.expectedBackAt.getTime(), zone),
          lastCheckInText: row.lastCheckInMs === null ? 'none since leaving' : formatWhen(row.lastCheckInMs, zone),
          sinceText: formatDuration(Math.floor((nowMs - a.alertSinceMs!) / MINUTE_MS))
        },
        boardUrl: baseUrl ? `${baseUrl}/field` : null
      })
      const result = enqueueOutboxMessage(db, {
        ...content,
        dedupeKey: fieldAlertKey(row.outing.id, a, person.id),
        kind: 'field-alert',
        personId: person.id,
        toEmail: person.email,
        meta: { outingId: row.outing.id, shiftId: row.shift.id, alert: a.alert, step: a.step }
      })
      if (result.created) created++
    }
  }
  return created
}

/** The person's own parties out now (not back), with the lone-worker interval. */
export function listOwnOpenOutings(db: Reader, personId: number, nowMs: number): { out: FieldParty[], soloCheckInMinutes: number } {
  const fieldSettings = loadFieldSettings(db)
  const mine = db.select({ shiftId: shiftAssignees.shiftId }).from(shiftAssignees).where(eq(shiftAssignees.personId, personId))
  const rows = loadOutings(db, and(isNull(fieldOutings.returnedAt), inArray(fieldOutings.shiftId, mine)))
  return { out: rows.map(row => toFieldParty(row, fieldSettings, nowMs)), soloCheckInMinutes: fieldSettings.soloCheckInMinutes }
}
