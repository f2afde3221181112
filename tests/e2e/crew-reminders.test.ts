// Evening-before reminders through the built server and a real SMTP sink (scripts/mail-sink.mjs,
// smtp-server + mailparser on a free port). Recipients are checked against the shifts in the
// database, read with plain SQL and local midnights from date-fns-tz; the light window in each mail
// against astronomy-engine 2.1.19 (SearchRiseSet for sunrise and sunset, SearchAltitude at −6° for
// civil dawn and dusk), within 2 minutes.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { Body, Observer, SearchAltitude, SearchRiseSet } from 'astronomy-engine'
import { fromZonedTime } from 'date-fns-tz'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { freePort, signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK, utcDateOf } from '../support/clock'

interface SinkMessage { to: string[], subject: string, text: string, html: string }
interface Sink { url: string, port: number, messages: SinkMessage[], close: () => Promise<void> }
interface SiteRow { id: number, name: string, latitude: number, longitude: number, timezone: string }

const MINUTE_MS = 60_000

function addDays(date: string, days: number) {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}
// the server's clock starts on a Saturday evening before a clock change: tomorrow is a Sunday
const CLOCK_START = TEST_CLOCK.saturdayEveningBeforeChange
const TOMORROW = utcDateOf(Date.parse(CLOCK_START), 1)

function localMidnight(date: string, timezone: string) {
  return fromZonedTime(`${date}T00:00:00`, timezone).getTime()
}

/** Who should get a reminder for a date, with their shift count: straight from the tables. */
function expectedReminders(databasePath: string, date: string): Map<string, number> {
  const db = new Database(databasePath, { readonly: true })
  const out = new Map<string, number>()
  for (const site of db.prepare('select id, timezone from sites').all() as SiteRow[]) {
    const rows = db.prepare(`select p.email as email, count(*) as n from shifts s join shift_assignees a on a.shift_id = s.id join people p on p.id = a.person_id
      where s.site_id = ? and s.cancelled_at is null and s.start_at >= ? and s.start_at < ? and p.active = 1 and p.reminders_enabled = 1 group by p.email`)
      .all(site.id, localMidnight(date, site.timezone), localMidnight(addDays(date, 1), site.timezone)) as { email: string, n: number }[]
    for (const r of rows) out.set(r.email, (out.get(r.email) ?? 0) + r.n)
  }
  db.close()
  return out
}

// "Sunrise      09:18 UTC+01:00" in a site block of the text part → the instant it names
function readTime(block: string, label: string, date: string, timezone: string): number | null {
  const match = new RegExp(`^${label}\\s+(\\d{2}):(\\d{2}) UTC`, 'm').exec(block)
  if (!match) return null
  return fromZonedTime(`${date}T${match[1]}:${match[2]}:00`, timezone).getTime()
}

function siteBlocks(text: string): { name: string, block: string }[] {
  return text.split(/^== /m).slice(1).map(part => ({ name: part.slice(0, part.indexOf(' ==')), block: part }))
}

async function waitFor(check: () => boolean | Promise<boolean>, ms = 15_000) {
  const deadline = Date.now() + ms
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error('timed out waiting')
    await new Promise(r => setTimeout(r, 100))
  }
}

describe('reminders for a date, with a live SMTP sink', () => {
  let sink: Sink
  let server: AppServer
  let sites: SiteRow[]

  beforeAll(async () => {
    sink = await startMailSink({ port: 0 })
    server = await startAppServer({ clockStart: CLOCK_START, env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off' } })
    sites = (await (await signedInClient(server, 'coordinator@gloamline.test')).get('/api/sites')).body
  })
  afterAll(async () => {
    await server?.stop()
    await sink?.close()
  })

  it('sends exactly one reminder to each assigned person, holding their shifts that day', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const expected = expectedReminders(server.databasePath, TOMORROW)
    expect(expected.size).toBeGreaterThan(3)
    const reply = await coordinator.post(`/api/reminders/run?date=${TOMORROW}`)
    expect(reply.status).toBe(200)
    expect(reply.body).toEqual({ sent: expected.size, pending: 0 })
    const recipients = sink.messages.flatMap(m => m.to)
    expect([...recipients].sort()).toEqual([...expected.keys()].sort())
    for (const message of sink.messages) {
      const shiftsInMail = (message.text.match(/^Shift: /gm) ?? []).length
      expect(shiftsInMail, message.to[0]).toBe(expected.get(message.to[0]!))
      expect(message.html).toContain('<table')
      expect(message.text).toContain('They help you plan; they never say that work is safe.')
    }
  })

  it('prints each site\'s light window as astronomy-engine has it, within 2 minutes', async () => {
    let checked = 0
    for (const message of sink.messages) {
      for (const { name, block } of siteBlocks(message.text)) {
        const site = sites.find(s => s.name === name)!
        const observer = new Observer(site.latitude, site.longitude, 0)
        const start = new Date(localMidnight(TOMORROW, site.timezone))
        const refs: [string, number | undefined][] = [
          ['Sunrise', SearchRiseSet(Body.Sun, observer, +1, start, 1)?.date.getTime()],
          ['Sunset', SearchRiseSet(Body.Sun, observer, -1, start, 1)?.date.getTime()],
          ['Civil dawn', SearchAltitude(Body.Sun, observer, +1, start, 1, -6)?.date.getTime()],
          ['Civil dusk', SearchAltitude(Body.Sun, observer, -1, start, 1, -6)?.date.getTime()]
        ]
        for (const [label, ref] of refs) {
          const printed = readTime(block, label, TOMORROW, site.timezone)
          const end = localMidnight(addDays(TOMORROW, 1), site.timezone)
          if (ref === undefined || ref >= end) {
            // no such crossing within the local day: the mail says none (polar night, midnight sun…)
            expect(new RegExp(`^${label}\\s+none`, 'm').test(block), `${name} ${label}`).toBe(true)
            continue
          }
          expect(printed, `${name} ${label}`).not.toBeNull()
          expect(Math.abs(printed! - ref), `${name} ${label}`).toBeLessThanOrEqual(2 * MINUTE_MS)
          checked++
        }
      }
    }
    expect(checked).toBeGreaterThan(4)
  })

  it('sends nothing more on a second run for the same date', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const before = sink.messages.length
    const again = await coordinator.post(`/api/reminders/run?date=${TOMORROW}`)
    expect(again.body).toEqual({ sent: 0, pending: 0 })
    // nothing more can go out: the outbox holds nothing unsent, and every message it sent has arrived
    const { counts } = (await coordinator.get('/api/outbox')).body
    expect(counts).toMatchObject({ queued: 0, failed: 0 })
    expect(sink.messages.length).toBe(counts.sent)
    expect(sink.messages.length).toBe(before)
  })

  it('leaves out a person who turned reminders off', async () => {
    const date = addDays(TOMORROW, 1)
    const expected = expectedReminders(server.databasePath, date)
    const someone = [...expected.keys()].find(email => email.endsWith('@gloamline.test'))!
    const person = await signedInClient(server, someone)
    expect((await person.patch('/api/me/preferences', { remindersEnabled: false })).body.remindersEnabled).toBe(false)
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const before = sink.messages.length
    const reply = await coordinator.post(`/api/reminders/run?date=${date}`)
    expect(reply.body.sent).toBe(expected.size - 1)
    const to = sink.messages.slice(before).flatMap(m => m.to)
    expect(to).not.toContain(someone)
    expect(to.sort()).toEqual([...expected.keys()].filter(e => e !== someone).sort())
  })

  it('answers bad input with a 400 naming the date, and refuses other roles', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    for (const query of ['', '?date=2027-02-30', '?date=tomorrow']) {
      const reply = await coordinator.post(`/api/reminders/run${query}`)
      expect(reply.status, query).toBe(400)
      expect(reply.body.message, query).toMatch(/date/)
    }
    const crew = await signedInClient(server, 'crew@gloamline.test')
    expect((await crew.post(`/api/reminders/run?date=${TOMORROW}`)).status).toBe(403)
  })
})

describe('an SMTP outage, then recovery', () => {
  it('keeps the reminders as failed, and after a restart with the mail server back delivers each exactly once', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'gloamline-outage-'))
    const databasePath = join(dir, 'outage.sqlite')
    const port = await freePort()
    let sink: Sink | undefined
    let server = await startAppServer({ clockStart: CLOCK_START, databasePath, env: { SMTP_URL: `smtp://127.0.0.1:${port}`, REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off' } })
    try {
      const expected = expectedReminders(databasePath, TOMORROW)
      let coordinator = await signedInClient(server, 'coordinator@gloamline.test')
      const down = await coordinator.post(`/api/reminders/run?date=${TOMORROW}`)
      expect(down.body).toEqual({ sent: 0, pending: expected.size })
      const failed = await coordinator.get('/api/outbox?status=failed')
      expect(failed.body.messages).toHaveLength(expected.size)
      expect(failed.body.messages[0].lastError).toMatch(/ECONNREFUSED|ESOCKET|ECONNECTION/)
      expect(failed.body.messages[0].nextAttemptAt).not.toBeNull()
      // a run while it is still down creates nothing new
      expect((await coordinator.post(`/api/reminders/run?date=${TOMORROW}`)).body).toEqual({ sent: 0, pending: expected.size })
      expect((await coordinator.get('/api/outbox')).body.messages).toHaveLength(expected.size)

      // restart on the same database, with the mail server now listening on that port
      await server.stop()
      sink = await startMailSink({ port }) as Sink
      server = await startAppServer({ clockStart: CLOCK_START, databasePath, env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off' } })
      coordinator = await signedInClient(server, 'coordinator@gloamline.test')
      const retried = await coordinator.post('/api/outbox/retry', {})
      expect(retried.body).toEqual({ retried: expected.size, sent: expected.size, failed: 0 })
      expect((await coordinator.post(`/api/reminders/run?date=${TOMORROW}`)).body).toEqual({ sent: 0, pending: 0 })
      // the runs answer once their sends are accepted, and the outbox (checked below) holds nothing unsent
      const to = sink.messages.flatMap(m => m.to)
      expect(to.sort()).toEqual([...expected.keys()].sort())
      expect(new Set(to).size).toBe(to.length)
      expect((await coordinator.get('/api/outbox')).body.counts).toEqual({ queued: 0, sent: expected.size, failed: 0 })
    } finally {
      await server.stop()
      await sink?.close()
      rmSync(dir, { recursive: true, force: true })
    }
  })

  it('the timer sends due reminders by itself and retries with back-off until the mail server comes up', async () => {
    const port = await freePort()
    const server = await startAppServer({ clockStart: TEST_CLOCK.southernSummerSunday, env: { SMTP_URL: `smtp://127.0.0.1:${port}`, REMINDER_TIMER_INTERVAL_MS: '300', MAIL_RETRY_BASE_MS: '300' } })
    let sink: Sink | undefined
    try {
      // every site's reminder hour is midnight: tomorrow's reminders are due now everywhere
      const db = new Database(server.databasePath)
      db.prepare('update sites set reminder_hour = 0').run()
      db.close()
      const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
      await waitFor(async () => (await coordinator.get('/api/outbox?status=failed')).body.messages.some((m: any) => m.attempts >= 2))
      sink = await startMailSink({ port }) as Sink
      await waitFor(async () => {
        const { counts } = (await coordinator.get('/api/outbox')).body
        return counts.sent > 0 && counts.failed === 0 && counts.queued === 0
      }, 30_000)
      const { messages, counts } = (await coordinator.get('/api/outbox?limit=500')).body
      expect(sink.messages.length).toBe(counts.sent)
      expect(messages.filter((m: any) => m.kind === 'reminder').length).toBeGreaterThan(3)
      // once each: as many deliveries as messages, never one address twice for the same subject
      const pairs = sink.messages.map(m => `${m.to[0]}|${m.subject}`)
      expect(new Set(pairs).size).toBe(pairs.length)
    } finally {
      await server.stop()
      await sink?.close()
    }
  })
})
