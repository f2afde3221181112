// Travel through the built server: a site's default travel, a shift's own, the light check over the
// whole outing (checkedFrom/checkedTo), the slot finder's outings in the light, and bad input naming
// the field. DESIGN.md, "Travel, weather holds, check-out and return". The sun is checked against
// astronomy-engine in tests/unit/travel-light.test.ts; here the server's own replies are compared
// with each other (a slot's outing, saved as a shift with the same travel, is not flagged).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

let server: AppServer
let coordinator: ApiClient
let siteId: number
let crewId: number
beforeAll(async () => {
  server = await startAppServer({ clockStart: TEST_CLOCK.fridayMidnightSun, env: { REMINDER_TIMER: 'off', REQUEST_LOG: 'off', FIELD_ALERT_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  // an invented site at 62.5° N, where early June still has a night: sunrise and sunset every day
  const site = await coordinator.post('/api/sites', { name: 'Travel Test Lake', latitude: 62.5, longitude: 10, timezone: 'Europe/Oslo', travelMinutes: 45 })
  expect(site.status).toBe(201)
  siteId = site.body.id
  crewId = ((await coordinator.get('/api/people')).body as { id: number, email: string }[]).find(p => p.email === 'crew@gloamline.test')!.id
})
afterAll(async () => {
  await server?.stop()
})

describe('travel minutes', () => {
  it('a new shift takes the site\'s travel, and its light check covers the outing', async () => {
    const shift = await coordinator.post('/api/shifts', { siteId, title: 'Shore survey', start: '2027-06-10T10:00', end: '2027-06-10T13:00', light: 'daylight', assigneeIds: [] })
    expect(shift.status).toBe(201)
    expect(shift.body.travelMinutes).toBe(45)
    expect(shift.body.lightCheck).toMatchObject({ checkedFrom: '2027-06-10T09:15:00+02:00', checkedTo: '2027-06-10T13:45:00+02:00', flagged: false })
    const own = await coordinator.patch(`/api/shifts/${shift.body.id}`, { travelMinutes: 90 })
    expect(own.status).toBe(200)
    expect(own.body.lightCheck).toMatchObject({ checkedFrom: '2027-06-10T08:30:00+02:00', checkedTo: '2027-06-10T14:30:00+02:00' })
  })

  it('flags a daylight task whose trip home runs past sunset though the time on site does not', async () => {
    // sunset at 62.5° N, 10° E on 10 June is about 23:30 local (almanac, memory): an hour from 21:00 is in daylight
    const sunsetish = await coordinator.post('/api/shifts', { siteId, title: 'Late net check', start: '2027-06-10T21:00', end: '2027-06-10T22:00', light: 'daylight', assigneeIds: [], travelMinutes: 0 })
    const withTrip = await coordinator.post('/api/shifts', { siteId, title: 'Late net check (by boat)', start: '2027-06-10T21:00', end: '2027-06-10T22:00', light: 'daylight', assigneeIds: [], travelMinutes: 180 })
    expect(sunsetish.body.lightCheck.flagged).toBe(false)
    expect(withTrip.body.lightCheck.minutesBelow).toBeGreaterThan(0)
    expect(withTrip.body.lightCheck.flagged).toBe(true)
  })

  it('proposes slots whose whole outing is in daylight: saved with the same travel, none is flagged', async () => {
    const search = await coordinator.post('/api/slots/search', { siteId, durationMinutes: 120, light: 'daylight', from: '2027-06-11', to: '2027-06-13', assigneeIds: [crewId], travelMinutes: 150, perDay: 2 })
    expect(search.status).toBe(200)
    expect(search.body.travelMinutes).toBe(150)
    const slots = search.body.slots as { start: string, end: string }[]
    expect(slots.length).toBeGreaterThan(0)
    for (const slot of slots) {
      const saved = await coordinator.post('/api/shifts', { siteId, title: 'From a slot', start: slot.start, end: slot.end, light: 'daylight', assigneeIds: [], travelMinutes: 150 })
      expect(saved.body.lightCheck.flagged, `${slot.start}–${slot.end}`).toBe(false)
    }
  })

  it('refuses travel outside 0–720 minutes, naming the field', async () => {
    for (const [path, body] of [
      ['/api/shifts', { siteId, title: 'Too far', start: '2027-06-10T10:00', end: '2027-06-10T11:00', light: 'any', assigneeIds: [], travelMinutes: 721 }],
      ['/api/slots/search', { siteId, durationMinutes: 60, light: 'any', from: '2027-06-10', to: '2027-06-10', assigneeIds: [crewId], travelMinutes: -1 }]
    ] as const) {
      const reply = await coordinator.post(path, body)
      expect(reply.status, path).toBe(400)
      expect(JSON.stringify(reply.body), path).toContain('travelMinutes')
    }
    const site = await coordinator.patch(`/api/sites/${siteId}`, { travelMinutes: 721 })
    expect(site.status).toBe(400)
    expect(JSON.stringify(site.body)).toContain('travelMinutes')
  })
})
