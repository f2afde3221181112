import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK, zonedDateOf } from '../support/clock'

// The outlook routes over HTTP against the built server and the demo scenario (invented sites and
// people). The astronomy itself is checked against astronomy-engine in tests/unit; here: shapes,
// validation (400 naming the field), and a slot turned into a shift that the light check clears.

let server: AppServer
let coordinator: ApiClient
let crew: ApiClient
let sites: { id: number, name: string, timezone: string }[]
const siteNamed = (name: string) => sites.find(s => s.name === name)!

function localToday(timezone: string) {
  return zonedDateOf(server.clock.now(), timezone)
}
function addDays(date: string, days: number) {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

beforeAll(async () => {
  // a Sunday morning in the southern summer: the far-south site is in midnight sun, the north dark
  server = await startAppServer({ clockStart: TEST_CLOCK.southernSummerSunday })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  crew = await signedInClient(server, 'crew@gloamline.test')
  sites = (await coordinator.get('/api/sites')).body
})
afterAll(async () => {
  await server?.stop()
})

describe('GET /api/sites/:id/year', () => {
  it('gives every day of the year as compact bands, with clock changes and season markers', async () => {
    const site = siteNamed('Kvitfjell Ice Camp')
    const reply = await crew.get(`/api/sites/${site.id}/year?year=2027`)
    expect(reply.status).toBe(200)
    expect(reply.body.days).toHaveLength(365)
    expect(reply.body.days[0].periods[0]).toEqual([expect.any(String), 0, expect.any(Number)])
    expect(reply.body.clockChanges.map((c: { date: string }) => c.date)).toEqual(['2027-03-28', '2027-10-31'])
    expect(reply.body.markers.map((m: { kind: string }) => m.kind)).toEqual(['march-equinox', 'june-solstice', 'september-equinox', 'december-solstice'])
    expect(reply.body.horizon.northernmostSunrise.azimuth).toBeLessThan(90)
  })

  it('answers 400 naming year for a bad year, and 404 for an unknown site', async () => {
    const bad = await crew.get(`/api/sites/${sites[0]!.id}/year?year=27`)
    expect(bad.status).toBe(400)
    expect(bad.body.message).toContain('year')
    expect((await crew.get('/api/sites/99999/year?year=2027')).status).toBe(404)
  })
})

describe('GET /api/sites/:id/runup', () => {
  it('counts the days left with 4 h of civil light at 78° N from 20 September', async () => {
    const site = siteNamed('Kvitfjell Ice Camp')
    const reply = await crew.get(`/api/sites/${site.id}/runup?minCivilHours=4&from=2026-09-20`)
    expect(reply.status).toBe(200)
    expect(reply.body).toMatchObject({ from: '2026-09-20', minCivilHours: 4, trend: 'darkening' })
    expect(reply.body.daysLeftWithCivilHours).toBeGreaterThan(20)
    expect(reply.body.polarNightBegins > reply.body.lastSunrise).toBe(true)
  })

  it('answers 400 naming minCivilHours when it is not a number', async () => {
    const reply = await crew.get(`/api/sites/${sites[0]!.id}/runup?minCivilHours=lots`)
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('minCivilHours')
  })
})

describe('GET /api/board', () => {
  it('lists every site with today, tomorrow and the next change of season', async () => {
    const reply = await coordinator.get('/api/board')
    expect(reply.status).toBe(200)
    expect(reply.body.sites).toHaveLength(sites.length)
    for (const s of reply.body.sites) {
      expect(s.today.date).toBe(localToday(s.timezone))
      expect(s.tomorrow.date).toBe(addDays(s.today.date, 1))
      expect(s.offset).toMatch(/^[+-]\d{2}:\d{2}$/)
    }
    // the demo plans shifts at every site most days
    expect(reply.body.sites.some((s: { today: { shifts: number } }) => s.today.shifts > 0)).toBe(true)
  })
})

describe('POST /api/slots/search', () => {
  const body = (over: Record<string, unknown> = {}) => {
    const site = siteNamed('Ravnvik Pipeline Yard')
    const from = addDays(localToday(site.timezone), 1)
    return { siteId: site.id, durationMinutes: 90, light: 'civil', from, to: addDays(from, 13), assigneeIds: [3], ...over }
  }

  it('proposes quarter-hour slots with the site\'s offset, and one becomes a shift the light check clears', async () => {
    // a new person with no other shifts: every day of the window has 90 minutes of civil light at 69° N
    // (at least about 4 h even at the winter solstice), so every day must get its slot
    const person = await coordinator.post('/api/people', { name: 'Slot Tester', email: 'slot.tester@gloamline.test', role: 'crew' })
    expect(person.status).toBe(201)
    const reply = await coordinator.post('/api/slots/search', body({ rank: 'margin', assigneeIds: [person.body.id] }))
    expect(reply.status).toBe(200)
    expect(reply.body.from).toBe(body().from)
    expect(reply.body.rules).toEqual({ minRestHours: 11, maxShiftHours: 12, reviewWindChillC: -27, weeklyLimitHours: null })
    expect(reply.body.daysSearched).toBe(14)
    expect(reply.body.daysWithSlots).toBe(14)
    expect(reply.body.slots).toHaveLength(14)
    expect(reply.body.reason).toBeNull()
    for (const slot of reply.body.slots) {
      expect(slot.start).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:(00|15|30|45):00[+-]\d{2}:\d{2}$/)
      expect(Date.parse(slot.end) - Date.parse(slot.start)).toBe(90 * 60_000)
    }
    const slot = reply.body.slots[0]
    const created = await coordinator.post('/api/shifts', { siteId: body().siteId, title: 'Valve check', start: slot.start, end: slot.end, light: 'civil', assigneeIds: slot.assigneeIds })
    expect(created.status).toBe(201)
    // no travel: the checked outing is the shift itself
    expect(created.body.lightCheck).toEqual({ requirement: 'civil', minutesBelow: 0, flagged: false, checkedFrom: created.body.start, checkedTo: created.body.end })
  })

  it('answers 400 naming assigneeIds when no people are given', async () => {
    const reply = await coordinator.post('/api/slots/search', body({ assigneeIds: [] }))
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('assigneeIds')
  })

  it('answers 400 naming to for a window over 90 days', async () => {
    const reply = await coordinator.post('/api/slots/search', body({ to: addDays(body().from, 90) }))
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('to')
    expect(reply.body.message).toContain('90 days')
  })

  it('answers 400 naming durationMinutes for a task longer than the window', async () => {
    const reply = await coordinator.post('/api/slots/search', body({ to: body().from, durationMinutes: 25 * 60 }))
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('durationMinutes')
  })

  it('answers 400 naming crewId for an unknown crew, and headcount when it exceeds the people', async () => {
    const crewReply = await coordinator.post('/api/slots/search', body({ assigneeIds: undefined, crewId: 9999 }))
    expect(crewReply.status).toBe(400)
    expect(crewReply.body.message).toContain('crewId')
    const head = await coordinator.post('/api/slots/search', body({ headcount: 3 }))
    expect(head.status).toBe(400)
    expect(head.body.message).toContain('headcount')
  })

  it('says why when there is no slot: daylight at 78° N in polar night', async () => {
    const site = siteNamed('Kvitfjell Ice Camp')
    // next year's December, so the window is always in the future
    const y = new Date(server.clock.now()).getUTCFullYear() + 1
    const reply = await coordinator.post('/api/slots/search', { siteId: site.id, durationMinutes: 60, light: 'daylight', from: `${y}-12-10`, to: `${y}-12-20`, assigneeIds: [3] })
    expect(reply.status).toBe(200)
    expect(reply.body.slots).toEqual([])
    expect(reply.body.reasonCode).toBe('light')
    expect(reply.body.reason).toEqual(expect.any(String))
  })

  it('is for coordinators only', async () => {
    expect((await crew.post('/api/slots/search', body())).status).toBe(403)
  })
})
