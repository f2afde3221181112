import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { createDarkShift, createDarkSite, dateFromToday, findPeopleIds, queryDatabase, startSafetyWorld, worldNowMs, type SafetyWorld } from '../support/safety-fixtures'

// Forecasts come from the local fake forecast server (scripts/fake-forecast.mjs) in its modes:
// normal, slow (never answers: the client times out after FORECAST_TIMEOUT_MS), garbage (not JSON),
// malformed (JSON of the wrong shape) and error (HTTP 500). Nothing reaches the network.
let world: SafetyWorld
let siteId: number
let crewIds: number[]

beforeAll(async () => {
  world = await startSafetyWorld()
  siteId = (await createDarkSite(world.coordinator, 'Invented Forecast Point')).id
  crewIds = (await findPeopleIds(world.coordinator)).crew
})
afterEach(() => {
  world.fake.setMode('normal')
})
afterAll(async () => {
  await world?.stop()
})

describe('forecast refresh', () => {
  it('stores a forecast with its source and fetch time and shows it in the review', async () => {
    const refreshed = await world.safety.post(`/api/sites/${siteId}/forecast/refresh`)
    expect(refreshed.status).toBe(200)
    expect(refreshed.body).toMatchObject({ refreshed: true, status: 'ok', forecast: { state: 'fresh' } })
    const stored = (await world.crew.get(`/api/sites/${siteId}/forecast`)).body
    expect(stored.latest.source).toBe(new URL(world.fake.url).host)
    expect(Date.parse(stored.latest.fetchedAt)).toBeGreaterThan(worldNowMs() - 60_000)
    expect(stored.latest.hours.length).toBeGreaterThan(24)
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 2, assigneeIds: crewIds.slice(0, 2) })
    const item = (await world.safety.get(`/api/review/${shift.id}`)).body
    expect(item.weather).toMatchObject({ basis: 'forecast', forecast: { state: 'fresh' } })
    expect(item.weather.label).toContain('Forecast fetched at')
  })

  for (const [mode, reason] of [['slow', 'timeout'], ['garbage', 'malformed'], ['malformed', 'malformed'], ['error', 'http-error']] as const) {
    it(`keeps the last good forecast when the service is in ${mode} mode, and the review still works`, async () => {
      await world.safety.post(`/api/sites/${siteId}/forecast/refresh`)
      const before = (await world.safety.get(`/api/sites/${siteId}/forecast`)).body
      world.fake.setMode(mode)
      const reply = await world.coordinator.post(`/api/sites/${siteId}/forecast/refresh`)
      expect(reply.status).toBe(200)
      expect(reply.body).toMatchObject({ refreshed: false, status: reason })
      const after = (await world.safety.get(`/api/sites/${siteId}/forecast`)).body
      expect(after.latest.id).toBe(before.latest.id)
      expect(after.latest.fetchedAt).toBe(before.latest.fetchedAt)
      expect(after.lastAttempt.status).toBe(reason)
      const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 3, assigneeIds: crewIds.slice(0, 2) })
      const item = await world.safety.get(`/api/review/${shift.id}`)
      expect(item.status).toBe(200)
      expect(item.body.weather.basis).toBe('forecast')
      expect(item.body.weather.label).toContain(`last fetch failed (${reason})`)
      // and the decision can still be made
      expect((await world.safety.post(`/api/shifts/${shift.id}/review`, { decision: 'approved', mitigations: ['portable-lighting'], note: '' })).status).toBe(201)
    })
  }

  it('records each failure with its reason in the forecasts table, next to the good rows', () => {
    const statuses = queryDatabase<{ status: string }>(world.server, 'select status from forecasts where site_id = ? order by id', siteId).map(r => r.status)
    expect(statuses).toEqual(expect.arrayContaining(['ok', 'timeout', 'malformed', 'http-error']))
  })
})

describe('a site with no forecast', () => {
  it('shows "No forecast", with no figures, and the review still works', async () => {
    const bare = (await createDarkSite(world.coordinator, 'Invented Bare Site')).id
    const shift = await createDarkShift(world.coordinator, bare, { daysAhead: 2, assigneeIds: crewIds.slice(0, 2) })
    const item = (await world.safety.get(`/api/review/${shift.id}`)).body
    expect(item.weather).toMatchObject({ basis: 'none', label: 'No forecast', figures: null })
    expect(item.cautions.map((c: { key: string }) => c.key)).toContain('no-forecast')
    expect((await world.safety.get(`/api/sites/${bare}/forecast`)).body).toMatchObject({ state: 'none', latest: null })
    expect((await world.safety.post(`/api/shifts/${shift.id}/review`, { decision: 'changes-requested', mitigations: [], note: 'Get a forecast first.' })).status).toBe(201)
  })
})

describe('a site whose first forecast fetch fails', () => {
  it('is marked "No forecast" with the failed fetch named, and the review still works', async () => {
    const site = (await createDarkSite(world.coordinator, 'Invented Unlucky Site')).id
    world.fake.setMode('garbage')
    expect((await world.safety.post(`/api/sites/${site}/forecast/refresh`)).body).toMatchObject({ refreshed: false, status: 'malformed', forecast: { state: 'none', latest: null } })
    const shift = await createDarkShift(world.coordinator, site, { daysAhead: 2, assigneeIds: crewIds.slice(0, 2) })
    const item = await world.safety.get(`/api/review/${shift.id}`)
    expect(item.status).toBe(200)
    expect(item.body.weather).toMatchObject({ basis: 'none', figures: null, forecast: { lastAttempt: { status: 'malformed' } } })
    expect(item.body.weather.label).toMatch(/^No forecast; last fetch failed \(malformed\) at /)
  })
})

describe('site readings', () => {
  it('stores a reading entered by hand and uses it when no forecast covers the shift', async () => {
    const bare = (await createDarkSite(world.coordinator, 'Invented Reading Site')).id
    const at = new Date(worldNowMs() - 30 * 60_000).toISOString()
    const added = await world.safety.post(`/api/sites/${bare}/observations`, { at, temperature: -22, wind: 25, units: 'metric' })
    expect(added.status).toBe(201)
    expect(added.body).toMatchObject({ temperatureC: -22, windKmh: 25, source: 'manual' })
    const listed = (await world.crew.get(`/api/sites/${bare}/observations`)).body
    expect(listed.observations).toHaveLength(1)
    // a shift starting within three hours of the reading: the figures come from it, marked as readings
    const start = new Date(worldNowMs() + 60 * 60_000).toISOString()
    const end = new Date(worldNowMs() + 2 * 60 * 60_000).toISOString()
    const shift = (await world.coordinator.post('/api/shifts', { siteId: bare, title: 'Reading-backed task', start, end, light: 'any', assigneeIds: crewIds.slice(0, 2) })).body
    const item = (await world.coordinator.get(`/api/review/${shift.id}`)).body
    expect(item.weather).toMatchObject({ basis: 'observations', observations: { count: 1 }, figures: { coldestTemperatureC: -22 } })
  })

  const BAD: [Record<string, unknown>, string][] = [
    [{ at: '2026-01-01T00:00:00Z', temperature: -95, wind: 5, units: 'metric' }, 'temperature'],
    [{ at: '2026-01-01T00:00:00Z', temperature: -20, wind: -3, units: 'metric' }, 'wind'],
    [{ at: '2026-01-01T00:00:00Z', temperature: -20, wind: 3, units: 'kelvin' }, 'units'],
    [{ at: 'yesterday', temperature: -20, wind: 3, units: 'metric' }, 'at'],
    // readings may be relayed up to 72 h ahead (a forecast by radio); five days ahead is refused
    [{ at: `${dateFromToday(5)}T00:00:00Z`, temperature: -20, wind: 3, units: 'metric' }, 'at'],
    [{ at: '2026-01-01T00:00:00Z', wind: 3, units: 'metric' }, 'temperature']
  ]
  for (const [body, field] of BAD) {
    it(`refuses a reading with a bad ${field} (400 naming it) and stores nothing`, async () => {
      const before = queryDatabase<{ n: number }>(world.server, 'select count(*) as n from observations')[0]!.n
      const reply = await world.safety.post(`/api/sites/${siteId}/observations`, body)
      expect(reply.status).toBe(400)
      expect(reply.body.data.issues[0].field).toBe(field)
      expect(queryDatabase<{ n: number }>(world.server, 'select count(*) as n from observations')[0]!.n).toBe(before)
    })
  }

  it('imports a CSV of readings in one go', async () => {
    const csv = `time,temperature,wind\n${dateFromToday(-1)}T06:00,-5,20\n${dateFromToday(-1)}T07:00,-6,24\n`
    const reply = await world.coordinator.post(`/api/sites/${siteId}/observations/upload`, { csv, units: 'imperial' })
    expect(reply.status).toBe(201)
    expect(reply.body.stored).toBe(2)
    // −5 °F = −20.6 °C; 20 mph = 32.2 km/h (stored to 0.1)
    expect(reply.body.observations[0]).toMatchObject({ temperatureC: -20.6, windKmh: 32.2, source: 'csv' })
  })

  it('refuses a CSV with one bad row, naming row and column, and stores none of it', async () => {
    const before = queryDatabase<{ n: number }>(world.server, 'select count(*) as n from observations')[0]!.n
    const csv = `time,temperature,wind\n${dateFromToday(-1)}T08:00,-5,20\n${dateFromToday(-1)}T09:00,-500,24\n`
    const reply = await world.coordinator.post(`/api/sites/${siteId}/observations/upload`, { csv, units: 'metric' })
    expect(reply.status).toBe(400)
    expect(reply.body.data.issues[0].field).toBe('csv.row3.temperature')
    expect(reply.body.message).toContain('csv.row3.temperature')
    expect(queryDatabase<{ n: number }>(world.server, 'select count(*) as n from observations')[0]!.n).toBe(before)
  })

  it('lets only safety and coordinators enter readings', async () => {
    const reply = await world.crew.post(`/api/sites/${siteId}/observations`, { at: new Date(worldNowMs()).toISOString(), temperature: -10, wind: 5 })
    expect(reply.status).toBe(403)
  })
})

describe('periodic forecast refresh', () => {
  it('is off unless FORECAST_REFRESH_MINUTES is set', () => {
    expect(world.server.output()).not.toContain('forecasts refresh every')
  })

  it('refreshes every site soon after start when enabled', async () => {
    const enabled = await startSafetyWorld({ FORECAST_REFRESH_MINUTES: '60', FORECAST_REFRESH_DELAY_MS: '0' })
    try {
      expect(enabled.server.output()).toContain('forecasts refresh every 60 min')
      const sites = (await enabled.safety.get('/api/sites')).body as { id: number }[]
      expect(sites.length).toBeGreaterThan(0)
      const states = async () => Promise.all(sites.map(async site => (await enabled.safety.get(`/api/sites/${site.id}/forecast`)).body.state))
      await expect.poll(states, { timeout: 20_000, interval: 250 }).toEqual(sites.map(() => 'fresh'))
    } finally {
      await enabled.stop()
    }
  })
})
