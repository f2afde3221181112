// Weather holds and readings from the field through the built server: the operator's levels are
// theirs to set (coordinator or safety), every shift reply carries the hold reached in the hours of
// its outing (travel included), and a reading relayed for the hours ahead counts. docs/api.md,
// "Travel, weather holds, check-out and return". Wind chill: the 2001 North American index (ECCC/NWS).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

const MIN = 60_000
const T0 = Date.parse(TEST_CLOCK.weekdayMorning)
const iso = (ms: number) => new Date(ms).toISOString()
const LEVELS = [
  { name: 'Short trips only', windKmh: 40, advice: 'Stay within sight of the station; radio every 30 minutes.' },
  { name: 'Stand-down', windChillC: -40, visibilityM: 200, advice: 'No travel. Stay in shelter until the level clears.' }
]

let server: AppServer
let coordinator: ApiClient
let siteId: number
beforeAll(async () => {
  server = await startAppServer({ env: { REMINDER_TIMER: 'off', REQUEST_LOG: 'off', FIELD_ALERT_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  siteId = ((await coordinator.get('/api/sites')).body as { id: number }[])[0]!.id
})
afterAll(async () => {
  await server?.stop()
})

describe('the operator\'s weather holds', () => {
  it('start empty, are set by safety, read by crew, and refused from crew', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    expect((await crew.get('/api/settings/holds')).body).toEqual({ levels: [] })
    expect((await crew.patch('/api/settings/holds', { levels: LEVELS })).status).toBe(403)
    const safety = await signedInClient(server, 'safety@gloamline.test')
    const saved = await safety.patch('/api/settings/holds', { levels: LEVELS })
    expect(saved.status).toBe(200)
    expect((await crew.get('/api/settings/holds')).body.levels.map((l: { name: string }) => l.name)).toEqual(['Short trips only', 'Stand-down'])
  })

  it('refuses a level with no figure and two levels of one name, naming the field', async () => {
    const none = await coordinator.patch('/api/settings/holds', { levels: [{ name: 'Odd', advice: 'x' }] })
    expect(none.status).toBe(400)
    expect(JSON.stringify(none.body)).toContain('levels.0.windKmh')
    const twice = await coordinator.patch('/api/settings/holds', { levels: [LEVELS[0], { ...LEVELS[1], name: 'short trips ONLY' }] })
    expect(twice.status).toBe(400)
    expect(JSON.stringify(twice.body)).toContain('levels.1.name')
    expect((await coordinator.get('/api/settings/holds')).body.levels).toHaveLength(2)
  })

  it('puts the most severe level reached in the outing on the shift, from a reading relayed for the hours ahead', async () => {
    // tomorrow, on site 09:30–12:30 UTC with 60 minutes' travel each way: the outing is 08:30–13:30
    const start = T0 + 24 * 60 * MIN
    const created = await coordinator.post('/api/shifts', { siteId, title: 'Antenna guy inspection', start: iso(start), end: iso(start + 180 * MIN), light: 'any', assigneeIds: [], travelMinutes: 60 })
    expect(created.status).toBe(201)
    const id = created.body.id as number
    expect(created.body.weatherHold ?? null).toBeNull()
    // a gusty hour (09:00) that starts during the trip out, before the time on site: the milder level
    expect((await coordinator.post(`/api/sites/${siteId}/observations`, { at: iso(start - 30 * MIN), temperature: -8, wind: 45, units: 'metric' })).status).toBe(201)
    const mild = (await coordinator.get(`/api/shifts/${id}`)).body.weatherHold
    expect(mild).toMatchObject({ level: 'Short trips only', cause: 'windKmh' })
    expect(Date.parse(mild.at)).toBe(start - 30 * MIN)
    // −30 °C in 30 km/h: wind chill −46 on ECCC's chart (memory; the 2001 formula gives −45.6): the stand-down level
    expect((await coordinator.post(`/api/sites/${siteId}/observations`, { at: iso(start + 90 * MIN), temperature: -30, wind: 30, units: 'metric' })).status).toBe(201)
    const severe = (await coordinator.get(`/api/shifts/${id}`)).body.weatherHold
    expect(severe).toMatchObject({ level: 'Stand-down', cause: 'windChillC', value: -46, limit: -40 })
    expect(Date.parse(severe.at)).toBe(start + 90 * MIN)
    const listed = (await coordinator.get(`/api/shifts?from=${iso(start - 60 * MIN)}&to=${iso(start + 300 * MIN)}`)).body as { id: number, weatherHold: unknown }[]
    expect(listed.find(s => s.id === id)!.weatherHold).toEqual(severe)
  })

  it('refuses a reading more than 72 hours ahead, naming the time', async () => {
    const far = await coordinator.post(`/api/sites/${siteId}/observations`, { at: iso(T0 + 73 * 60 * MIN), temperature: -8, wind: 10, units: 'metric' })
    expect(far.status).toBe(400)
    expect(JSON.stringify(far.body)).toContain('"at"')
  })
})
