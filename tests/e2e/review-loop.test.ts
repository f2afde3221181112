// The review loop through the built server and a real SMTP sink: every reason sends work to review
// with its figure, decisions need substance, a send-back or rejection mails the coordinator and shows
// where they plan, a re-opened shift shows what changed, and the calendar feed's STATUS tells the truth.
import ICAL from 'ical.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK, utcDateOf } from '../support/clock'
import { referenceAltitude } from '../support/sun-reference'

interface SinkMessage { to: string[], subject: string, text: string, html: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let server: AppServer
let coordinator: ApiClient
let safety: ApiClient
let crew: ApiClient
let crewId: number
let otherCrewId: number
let polarSiteId: number
// Wednesday 18 November 2026: polar night at 78° N
const CLOCK_START = TEST_CLOCK.weekdayMorning
const day = utcDateOf(Date.parse(CLOCK_START), 5)
const shiftIds: Record<string, number> = {}

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  server = await startAppServer({ clockStart: CLOCK_START, env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off', PUBLIC_BASE_URL: 'https://field.northwake.test' } })
  ;[coordinator, safety, crew] = await Promise.all([
    signedInClient(server, 'coordinator@gloamline.test'),
    signedInClient(server, 'safety@gloamline.test'),
    signedInClient(server, 'crew@gloamline.test')
  ])
  const people = (await coordinator.get('/api/people')).body as { id: number, email: string, role: string }[]
  crewId = people.find(p => p.email === 'crew@gloamline.test')!.id
  otherCrewId = people.find(p => p.role === 'crew' && p.id !== crewId)!.id
  // an invented site at 78.22° N, 15.65° E
  const site = await coordinator.post('/api/sites', { name: 'Invented Polar Test Hut', latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' })
  expect(site.status, JSON.stringify(site.body)).toBe(201)
  polarSiteId = site.body.id
})
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

async function feedStatuses(): Promise<Map<string, string>> {
  const { url } = (await crew.get('/api/me/feed')).body
  // the feed's address carries PUBLIC_BASE_URL; the test reaches the same path on the local server
  const text = await (await fetch(String(url).replace(/^https?:\/\/[^/]+/, server.url))).text()
  const calendar = new ICAL.Component(ICAL.parse(text))
  return new Map(calendar.getAllSubcomponents('vevent').map(v => [String(v.getFirstPropertyValue('uid')), String(v.getFirstPropertyValue('status'))]))
}

describe('the operator\'s cold limit in the work rules', () => {
  it('defaults to −27 °C, takes a new value, and refuses one out of range naming the field', async () => {
    expect((await coordinator.get('/api/settings/work-rules')).body.reviewWindChillC).toBe(-27)
    expect((await coordinator.patch('/api/settings/work-rules', { reviewWindChillC: -30 })).body.reviewWindChillC).toBe(-30)
    const bad = await coordinator.patch('/api/settings/work-rules', { reviewWindChillC: -100 })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(bad.body)).toContain('reviewWindChillC')
    expect((await coordinator.patch('/api/settings/work-rules', { reviewWindChillC: -27 })).body.reviewWindChillC).toBe(-27)
  })
})

describe('every reason sends work to review', () => {
  it('sends a lone worker\'s lit-area shift in polar night to the queue as lone, with its dark minutes', async () => {
    // astronomy-engine: the sun stays below −6° over the whole window at this site on this date
    for (let t = Date.parse(`${day}T09:00:00Z`); t <= Date.parse(`${day}T13:00:00Z`); t += 30 * 60_000) {
      expect(referenceAltitude(t, 78.22, 15.65)).toBeLessThan(-6)
    }
    const reply = await coordinator.post('/api/shifts', { siteId: polarSiteId, title: 'Lone generator check', start: `${day}T09:00:00Z`, end: `${day}T13:00:00Z`, light: 'any', assigneeIds: [crewId] })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.lightCheck.flagged).toBe(false)
    expect(reply.body.reviewState).toBe('pending')
    expect(reply.body.reviewReasons).toEqual(['lone'])
    expect(reply.body.reviewReasonDetails).toEqual([{ reason: 'lone', minutesDark: 240 }])
    shiftIds.lone = reply.body.id
    const queue = (await safety.get(`/api/review/queue?siteId=${polarSiteId}`)).body
    expect(queue.items.map((i: any) => i.shift.id)).toContain(shiftIds.lone)
  })

  it('sends a 14 h shift of two people in a lit area to the queue as long (work rules: 12 h)', async () => {
    const reply = await coordinator.post('/api/shifts', { siteId: polarSiteId, title: 'Long fuel transfer', start: `${utcDateOf(Date.parse(day), 1)}T06:00:00Z`, end: `${utcDateOf(Date.parse(day), 1)}T20:00:00Z`, light: 'any', assigneeIds: [crewId, otherCrewId] })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.reviewReasons).toEqual(['long'])
    expect(reply.body.reviewReasonDetails).toEqual([{ reason: 'long', minutes: 840, maxMinutes: 720 }])
    shiftIds.long = reply.body.id
    const queue = (await safety.get(`/api/review/queue?siteId=${polarSiteId}`)).body
    expect(queue.items.map((i: any) => i.shift.id)).toContain(shiftIds.long)
  })

  it('marks waiting work TENTATIVE in the person\'s calendar feed (docs/api.md, RFC 5545 STATUS)', async () => {
    const statuses = await feedStatuses()
    expect(statuses.get(`shift-${shiftIds.lone}@gloamline`)).toBe('TENTATIVE')
    expect(statuses.get(`shift-${shiftIds.long}@gloamline`)).toBe('TENTATIVE')
  })
})

describe('decisions with substance, and outcomes where the coordinator works', () => {
  it('refuses an approval without a mitigation with 400 naming mitigations', async () => {
    const reply = await safety.post(`/api/shifts/${shiftIds.long}/review`, { decision: 'approved', mitigations: [], note: '' })
    expect(reply.status).toBe(400)
    expect(JSON.stringify(reply.body)).toContain('mitigations')
    expect((await coordinator.get(`/api/shifts/${shiftIds.long}`)).body.reviewState).toBe('pending')
  })

  it('sends a shift back: the coordinator is mailed the note and finds it among the outcomes', async () => {
    const note = 'Two people on this one, or a check-in every 30 min by radio.'
    const reply = await safety.post(`/api/shifts/${shiftIds.lone}/review`, { decision: 'changes-requested', mitigations: ['check-in-interval:30'], note })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.shift.review).toMatchObject({ decision: 'changes-requested', note, reviewerName: 'Tomas Reyes', current: true })
    const mailed = () => sink.messages.filter(m => m.to.includes('coordinator@gloamline.test') && /^Sent back by safety review: Lone generator check/.test(m.subject))
    await until(() => mailed().length === 1)
    expect(mailed()[0]!.text).toContain(note)
    expect(mailed()[0]!.text).toContain('Check-in every 30 min')
    expect(mailed()[0]!.text).toContain('Alone in the dark: one person, 4 h with the sun below −6°')
    expect(mailed()[0]!.text).toContain(`https://field.northwake.test/plan?site=${polarSiteId}&date=${day}&shift=${shiftIds.lone}`)
    const outcomes = (await coordinator.get('/api/review/outcomes')).body as any[]
    expect(outcomes.find(s => s.id === shiftIds.lone)?.review.note).toBe(note)
    expect((await feedStatuses()).get(`shift-${shiftIds.lone}@gloamline`)).toBe('TENTATIVE')
  })

  it('marks a rejected shift CANCELLED in the feed and an approved one CONFIRMED', async () => {
    expect((await safety.post(`/api/shifts/${shiftIds.lone}/review`, { decision: 'rejected', note: 'Not alone in polar night.' })).status).toBe(201)
    expect((await safety.post(`/api/shifts/${shiftIds.long}/review`, { decision: 'approved', mitigations: ['warmup-breaks', 'other:Swap drivers at 13:00'] })).status).toBe(201)
    const statuses = await feedStatuses()
    expect(statuses.get(`shift-${shiftIds.lone}@gloamline`)).toBe('CANCELLED')
    expect(statuses.get(`shift-${shiftIds.long}@gloamline`)).toBe('CONFIRMED')
  })

  it('shows on a re-opened shift\'s review page what changed, with old and new values', async () => {
    const before = (await coordinator.get(`/api/shifts/${shiftIds.long}`)).body
    const later = `${utcDateOf(Date.parse(day), 1)}T21:00:00Z`
    const patch = await coordinator.patch(`/api/shifts/${shiftIds.long}`, { end: later, version: before.version })
    expect(patch.body.reviewState).toBe('pending')
    const item = (await safety.get(`/api/review/${shiftIds.long}`)).body
    expect(item.changes).toEqual([{ field: 'end', label: 'End', before: before.end, after: patch.body.end }])
    expect(item.shift.reviewReasonDetails).toEqual([{ reason: 'long', minutes: 900, maxMinutes: 720 }])
  })
})
