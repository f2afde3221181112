// Notices through the built server and a real SMTP sink: people on a shift hear when it changes or is
// cancelled, people taken off it hear that, and every active safety officer hears when new work is
// flagged below the light it needs. Each notice goes out once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK, utcDateOf } from '../support/clock'

interface SinkMessage { to: string[], subject: string, text: string, html: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let server: AppServer
let coordinator: ApiClient
let people: { id: number, email: string, role: string, active: boolean }[]
let window: { siteId: number, startMs: number }
const CLOCK_START = TEST_CLOCK.saturdayEveningBeforeChange
const day = utcDateOf(Date.parse(CLOCK_START), 5)

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  // notices come from no request of the person reading them: their links use PUBLIC_BASE_URL
  server = await startAppServer({ clockStart: CLOCK_START, env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off', PUBLIC_BASE_URL: 'https://field.northwake.test' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  people = (await coordinator.get('/api/people')).body
  window = await findSunDownWindow(coordinator, day)
})

// The first site and stretch of at least 3 hours without daylight on a date, read from the light
// engine's contract, so the test does not depend on the season.
async function findSunDownWindow(client: ApiClient, date: string) {
  for (const site of (await client.get('/api/sites')).body) {
    const [light] = (await client.get(`/api/sites/${site.id}/light?from=${date}&to=${date}`)).body.days
    const dark = light.periods.find((p: any) => p.kind !== 'day' && Date.parse(p.end) - Date.parse(p.start) >= 4 * 3_600_000)
    if (dark) return { siteId: site.id as number, startMs: Date.parse(dark.start) + 15 * 60_000 }
  }
  throw new Error(`no site has 4 hours without daylight on ${date}`)
}
const iso = (ms: number) => new Date(ms).toISOString()
afterAll(async () => {
  await server?.stop()
  await sink?.close()
})

async function until(check: () => boolean, ms = 10_000) {
  const deadline = Date.now() + ms
  while (!check()) {
    if (Date.now() > deadline) throw new Error('timed out waiting for mail')
    await new Promise(r => setTimeout(r, 100))
  }
}

const idOf = (email: string) => people.find(p => p.email === email)!.id
const mailTo = (email: string, subject: RegExp) => sink.messages.filter(m => m.to.includes(email) && subject.test(m.subject))
/** The newest outbox message id: what a change queued is what lies above it afterwards. */
const newestOutboxId = async () => ((await coordinator.get('/api/outbox?limit=1')).body.messages[0]?.id ?? 0) as number
const outboxAbove = async (id: number) => ((await coordinator.get('/api/outbox?limit=500')).body.messages as { id: number, kind: string, toEmail: string }[]).filter(m => m.id > id)

describe('shift notices', () => {
  let shiftId: number
  let version: number

  it('tells every active safety officer, in one digest each, when new work waits for review', async () => {
    const reply = await coordinator.post('/api/shifts', {
      siteId: window.siteId, title: 'Night hoist inspection', light: 'daylight', start: iso(window.startMs), end: iso(window.startMs + 3 * 3_600_000),
      assigneeIds: [idOf('liv.aasen@gloamline.test'), idOf('jonas.eide@gloamline.test')], overrideReason: 'notice test'
    })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.lightCheck.flagged).toBe(true)
    shiftId = reply.body.id
    version = reply.body.version
    const officers = people.filter(p => p.role === 'safety' && p.active).map(p => p.email)
    expect(officers.length).toBeGreaterThan(0)
    // the first digest also lists the demo's waiting shifts that no digest listed before
    const digestsWith = (e: string) => mailTo(e, /^(Review needed|Back for review): /).filter(m => m.text.includes('Night hoist inspection'))
    await until(() => officers.every(e => digestsWith(e).length === 1))
    const mail = digestsWith(officers[0]!)[0]!
    expect(mail.text).toMatch(/Below its light: \d+ (h|min)[^\n]* below daylight/)
    expect(mail.text).toContain(`Review it: https://field.northwake.test/review/${shiftId}`)
    expect(mail.text).toContain('Review queue: https://field.northwake.test/review')
  })

  it('tells the people on a shift when its time changes, and whoever was taken off it', async () => {
    const above = await newestOutboxId()
    const reply = await coordinator.patch(`/api/shifts/${shiftId}`, { version, start: iso(window.startMs + 30 * 60_000), end: iso(window.startMs + 3.5 * 3_600_000), assigneeIds: [idOf('liv.aasen@gloamline.test')], overrideReason: 'notice test' })
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    version = reply.body.version
    await until(() => mailTo('liv.aasen@gloamline.test', /^Changed: Night hoist inspection/).length === 1 && mailTo('jonas.eide@gloamline.test', /^Taken off: Night hoist inspection/).length === 1)
    const changed = mailTo('liv.aasen@gloamline.test', /^Changed/)[0]!
    expect(changed.text).toMatch(/Time: \d{2}:\d{2}–\d{2}:\d{2} UTC[+−]\d{2}:\d{2}/)
    expect(changed.text).toContain('With: nobody else (you are on your own)')
    expect(changed.text).toContain('Changed by Ingrid Halvorsen.')
    // the change reopened nothing that had been decided: still the first review round, no second notice.
    // Both notices have arrived, so everything the change queued is in the outbox by now.
    expect((await outboxAbove(above)).map(m => m.kind).sort()).toEqual(['shift-changed', 'shift-removed'])
    expect(mailTo('safety@gloamline.test', /^(Review needed|Back for review): /).filter(m => m.text.includes('Night hoist inspection'))).toHaveLength(1)
  })

  it('writes to nobody for a change to the title only, and tells the people on it when it is cancelled', async () => {
    const above = await newestOutboxId()
    const before = sink.messages.length
    const renamed = await coordinator.patch(`/api/shifts/${shiftId}`, { version, title: 'Night hoist inspection and log' })
    expect(renamed.status).toBe(200)
    version = renamed.body.version
    const reply = await coordinator.delete(`/api/shifts/${shiftId}?version=${version}`)
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    await until(() => mailTo('liv.aasen@gloamline.test', /^Cancelled: Night hoist inspection/).length === 1)
    // the cancellation's notice came after anything the rename could have queued: only it is new
    expect((await outboxAbove(above)).map(m => m.kind)).toEqual(['shift-cancelled'])
    expect(sink.messages.slice(before).map(m => m.subject)).toEqual([expect.stringMatching(/^Cancelled: Night hoist inspection and log,/)])
    expect(mailTo('liv.aasen@gloamline.test', /^Cancelled/)[0]!.text).toContain('will not take place')
    expect(mailTo('jonas.eide@gloamline.test', /^Cancelled/)).toHaveLength(0)
    const outbox = (await coordinator.get('/api/outbox?kind=shift-cancelled')).body.messages
    expect(outbox).toHaveLength(1)
    expect(outbox[0].status).toBe('sent')
  })
})
