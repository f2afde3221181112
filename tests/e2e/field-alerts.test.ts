// Check-out, check-in and return through the built server, and the alerts by SMTP: a lone worker who
// misses a check-in and a party that is late back raise one mail per escalation step to every active
// safety officer and coordinator, once, across SIGKILL restarts and with two processes on one
// database. Time moves by restarting the server with its test clock further on (GLOAMLINE_CLOCK_START),
// never by waiting. The rules are those of docs/api.md ("Travel, weather holds and the field").
import Database from 'better-sqlite3'
import { afterEach, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

type Sink = Awaited<ReturnType<typeof startMailSink>>
const running: AppServer[] = []
let sink: Sink | undefined
afterEach(async () => {
  for (const s of running.splice(0).reverse()) await s.stop()
  await sink?.close()
  sink = undefined
})

const MIN = 60_000
const T0 = Date.parse(TEST_CLOCK.weekdayMorning)
const iso = (ms: number) => new Date(ms).toISOString()

function readDb<T>(path: string, sql: string): T[] {
  const db = new Database(path, { readonly: true })
  try {
    return db.prepare(sql).all() as T[]
  } finally {
    db.close()
  }
}

const alertRecipients = (path: string) => readDb<{ email: string }>(path, 'select email from people where active = 1 and role in (\'safety\', \'coordinator\') order by email').map(r => r.email)
const alertRows = (path: string) => readDb<{ status: string, key: string }>(path, 'select status, dedupe_key as key from messages where kind = \'field-alert\'')

async function waitUntil(what: string, test: () => boolean, ms = 20_000) {
  const deadline = performance.now() + ms
  while (!test()) {
    if (performance.now() > deadline) throw new Error(`timed out waiting for ${what}`)
    await new Promise(r => setTimeout(r, 100))
  }
}

async function start(env: Record<string, string>, clockStartMs: number, databasePath?: string) {
  const server = await startAppServer({ env, clockStart: iso(clockStartMs), databasePath })
  running.push(server)
  return server
}

async function planShift(server: AppServer, title: string, assigneeEmails: string[], startMs: number, endMs: number) {
  const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
  const sites = (await coordinator.get('/api/sites')).body as { id: number }[]
  const assigneeIds = assigneeEmails.map(e => people.find(p => p.email === e)!.id)
  const created = await coordinator.post('/api/shifts', { siteId: sites[0]!.id, title, start: iso(startMs), end: iso(endMs), light: 'any', assigneeIds })
  expect(created.status).toBe(201)
  return { coordinator, shiftId: created.body.id as number }
}

describe('a lone worker who misses a check-in', () => {
  it('mails every safety officer and coordinator once per step across SIGKILL restarts; the board shows it; a check-in clears it', async () => {
    sink = await startMailSink()
    const env = { REMINDER_TIMER: 'off', REQUEST_LOG: 'off', SMTP_URL: sink.url, FIELD_ALERT_INTERVAL_MS: '250' }
    const first = await start(env, T0)
    const db = first.databasePath
    const recipients = alertRecipients(db)
    expect(recipients.length).toBeGreaterThanOrEqual(2)
    const { coordinator, shiftId } = await planShift(first, 'Mast guy-wire check (alone)', ['crew@gloamline.test'], T0 + 10 * MIN, T0 + 5 * 60 * MIN)
    expect((await coordinator.patch('/api/settings/field', { soloCheckInMinutes: 60, overdueGraceMinutes: 30, escalateEveryMinutes: 30 })).status).toBe(200)
    const crew = await signedInClient(first, 'crew@gloamline.test')
    const out = await crew.post(`/api/shifts/${shiftId}/departure`, {})
    expect(out.status).toBe(201)
    expect(out.body).toMatchObject({ shiftId, state: 'out', lastCheckInAt: null })
    expect(Date.parse(out.body.expectedBackAt)).toBe(T0 + 5 * 60 * MIN)
    // crew may not see the board
    expect((await crew.get('/api/field')).status).toBe(403)
    await first.kill()

    // 62 minutes after leaving with no call: step 1 at once
    const second = await start(env, T0 + 62 * MIN, db)
    await sink.waitFor('accepted', recipients.length)
    await waitUntil('step 1 marked sent', () => alertRows(db).filter(r => r.status === 'sent').length === recipients.length)
    expect(sink.messages.map(m => m.to[0]).sort()).toEqual(recipients)
    const mail = sink.messages[0]!
    expect(mail.subject).toBe('Lone worker: check-in missed: Mast guy-wire check (alone) at ' + mail.subject.split(' at ').pop())
    expect(mail.text).toContain('Left: ')
    expect(mail.text).toContain('Expected back: ')
    expect(mail.text).toContain('an alert is no rescue plan')
    const safety = await signedInClient(second, 'safety@gloamline.test')
    const board = (await safety.get('/api/field')).body.out as { shiftId: number, state: string, words: string }[]
    expect(board.find(p => p.shiftId === shiftId)).toMatchObject({ state: 'check-in-missed' })
    await second.kill()

    // restarted within the same step: nothing new, however many checks run
    const third = await start(env, T0 + 70 * MIN, db)
    // no event marks "nothing was queued": give the check (every 250 ms) time to run several times
    await new Promise(r => setTimeout(r, 1_500))
    expect(alertRows(db)).toHaveLength(recipients.length)
    expect(sink.messages).toHaveLength(recipients.length)
    await third.kill()

    // past the escalation interval: step 2, once each
    const fourth = await start(env, T0 + 93 * MIN, db)
    await sink.waitFor('accepted', 2 * recipients.length)
    expect(sink.messages.slice(recipients.length).every(m => m.subject.startsWith('Lone worker: check-in missed (reminder 1)'))).toBe(true)
    // the crew member calls in: the alert clears, and no further step is queued
    const crewAgain = await signedInClient(fourth, 'crew@gloamline.test')
    const call = await crewAgain.post(`/api/shifts/${shiftId}/check-in`, { note: 'All well, one more tower' })
    expect(call.status).toBe(201)
    expect(call.body.state).toBe('out')
    const boardAfter = (await (await signedInClient(fourth, 'safety@gloamline.test')).get('/api/field')).body.out as { shiftId: number, state: string }[]
    expect(boardAfter.find(p => p.shiftId === shiftId)!.state).toBe('out')
    await new Promise(r => setTimeout(r, 1_000))
    expect(alertRows(db)).toHaveLength(2 * recipients.length)
    const back = await crewAgain.post(`/api/shifts/${shiftId}/return`, {})
    expect(back.status).toBe(200)
    expect(back.body.state).toBe('back')
    expect((await crewAgain.post(`/api/shifts/${shiftId}/return`, {})).status).toBe(409)
  }, 120_000)
})

describe('a party late back, watched by two server processes on one database', () => {
  it('raises the overdue alert once per person, whichever process checks', async () => {
    sink = await startMailSink()
    const env = { REMINDER_TIMER: 'off', REQUEST_LOG: 'off', SMTP_URL: sink.url, FIELD_ALERT_INTERVAL_MS: '200' }
    const first = await start(env, T0)
    const db = first.databasePath
    const recipients = alertRecipients(db)
    const { coordinator, shiftId } = await planShift(first, 'Fuel cache count', ['crew@gloamline.test', 'coordinator@gloamline.test'], T0 + 5 * MIN, T0 + 65 * MIN)
    expect((await coordinator.patch('/api/settings/field', { overdueGraceMinutes: 0 })).status).toBe(200)
    // coordinator records the departure on the party's behalf, with an earlier expected return
    const out = await coordinator.post(`/api/shifts/${shiftId}/departure`, { expectedBackAt: iso(T0 + 20 * MIN) })
    expect(out.status).toBe(201)
    await first.kill()

    const a = await start(env, T0 + 25 * MIN, db)
    const b = await start(env, T0 + 25 * MIN, db)
    await sink.waitFor('accepted', recipients.length)
    await waitUntil('all sent', () => alertRows(db).every(r => r.status === 'sent'))
    await new Promise(r => setTimeout(r, 1_000))
    expect(sink.messages.map(m => m.to[0]).sort()).toEqual(recipients)
    expect(sink.messages[0]!.subject).toMatch(/^Party overdue: Fuel cache count at /)
    const board = (await (await signedInClient(b, 'safety@gloamline.test')).get('/api/field')).body.out as { shiftId: number, state: string, words: string }[]
    const party = board.find(p => p.shiftId === shiftId)!
    expect(party.state).toBe('overdue')
    expect(party.words).toMatch(/^Overdue by /)
    expect(a.output()).not.toMatch(/field alert check failed/)
  }, 120_000)
})

describe('field input', () => {
  it('refuses a past expected return naming the field, a check-in when not out, and another person\'s shift', async () => {
    const server = await start({ REMINDER_TIMER: 'off', REQUEST_LOG: 'off', FIELD_ALERT_TIMER: 'off' }, T0)
    const { shiftId } = await planShift(server, 'Snow stake survey', ['safety@gloamline.test'], T0 + 60 * MIN, T0 + 120 * MIN)
    const safety = await signedInClient(server, 'safety@gloamline.test')
    const past = await safety.post(`/api/shifts/${shiftId}/departure`, { expectedBackAt: iso(T0 - MIN) })
    expect(past.status).toBe(400)
    expect(JSON.stringify(past.body)).toContain('expectedBackAt')
    const bad = await safety.post(`/api/shifts/${shiftId}/departure`, { expectedBackAt: 'tomorrow' })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(bad.body)).toContain('expectedBackAt')
    expect((await safety.post(`/api/shifts/${shiftId}/check-in`, {})).status).toBe(409)
    const crew = await signedInClient(server, 'crew@gloamline.test')
    expect((await crew.post(`/api/shifts/${shiftId}/departure`, {})).status).toBe(404)
    expect((await new ApiClient(server.url).post(`/api/shifts/${shiftId}/departure`, {})).status).toBe(401)
    const settings = await safety.patch('/api/settings/field', { escalateEveryMinutes: 0 })
    expect(settings.status).toBe(400)
    expect(JSON.stringify(settings.body)).toContain('escalateEveryMinutes')
    expect((await crew.patch('/api/settings/field', { overdueGraceMinutes: 5 })).status).toBe(403)
    expect((await crew.get('/api/settings/field')).body).toEqual({ overdueGraceMinutes: 30, soloCheckInMinutes: 120, escalateEveryMinutes: 30 })
  }, 60_000)
})
