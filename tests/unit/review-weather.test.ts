import { eq } from 'drizzle-orm'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { auditLog, forecasts, observations, people, sites } from '../../server/db/schema'
import {
  convertObservationInput,
  describeWindowWeather,
  insertSiteObservations,
  loadSiteForecast,
  loadSiteObservations,
  parseObservationCsv,
  refreshSiteForecast,
  type SiteForecastState
} from '../../server/services/site-weather'
import { startFakeForecastServer } from '../../scripts/fake-forecast.mjs'

// Every fetch here goes to the local fake forecast server on 127.0.0.1: no test reaches the network.
const HOUR = 3_600_000
const NOW = Date.parse('2026-12-01T10:30:00Z')
const ZONE = 'Arctic/Longyearbyen'
let fake: Awaited<ReturnType<typeof startFakeForecastServer>>

beforeAll(async () => {
  fake = await startFakeForecastServer({ port: 0, now: () => NOW })
})
afterAll(async () => {
  await fake.close()
})
afterEach(() => {
  fake.setMode('normal')
  removeTestDatabases()
})

function freshSite() {
  const db = createTestDatabase('gloamline-weather-')
  // an invented site at real coordinates (demo-style data, not a reference)
  const site = db.insert(sites).values({ name: 'Invented camp', latitude: 78.22, longitude: 15.63, timezone: ZONE }).returning().get()
  const person = db.insert(people).values({ name: 'Invented Reviewer', email: 'reviewer@example.test', role: 'safety' }).returning().get()
  return { db, site, person }
}

describe('storing forecasts', () => {
  it('stores a good forecast with its source and fetch time', async () => {
    const { db, site } = freshSite()
    const outcome = await refreshSiteForecast(db, site, { baseUrl: fake.url, nowMs: () => NOW })
    expect(outcome).toMatchObject({ refreshed: true, status: 'ok' })
    const state = loadSiteForecast(db, site.id, Date.now())
    expect(state.state).toBe('fresh')
    expect(state.latest!.source).toBe(new URL(fake.url).host)
    // 16 days of hours from the fake (Open-Meteo serves at most 16)
    expect(state.latest!.hours).toHaveLength(16 * 24)
    expect(state.lastAttempt).toMatchObject({ status: 'ok' })
  })

  for (const [mode, reason] of [['slow', 'timeout'], ['garbage', 'malformed'], ['malformed', 'malformed'], ['error', 'http-error']] as const) {
    it(`keeps the last good forecast when the service answers in ${mode} mode, recording '${reason}'`, async () => {
      const { db, site } = freshSite()
      await refreshSiteForecast(db, site, { baseUrl: fake.url })
      const good = loadSiteForecast(db, site.id, Date.now()).latest!
      fake.setMode(mode)
      const outcome = await refreshSiteForecast(db, site, { baseUrl: fake.url, timeoutMs: 300, actorId: null })
      expect(outcome).toMatchObject({ refreshed: false, status: reason })
      const after = loadSiteForecast(db, site.id, Date.now())
      expect(after.latest).toEqual(good)
      expect(after.lastAttempt).toMatchObject({ status: reason })
      expect(db.select().from(forecasts).where(eq(forecasts.siteId, site.id)).all().map(r => r.status)).toEqual(['ok', reason])
      expect(db.select().from(auditLog).all().map(a => a.action)).toEqual(['forecast.refresh'])
    })
  }

  it('prunes old attempts but never the last good forecast', async () => {
    const { db, site } = freshSite()
    const longAgo = NOW - 30 * 24 * HOUR
    await refreshSiteForecast(db, site, { baseUrl: fake.url, nowMs: () => longAgo })
    db.update(forecasts).set({ fetchedAt: new Date(longAgo) }).run()
    fake.setMode('error')
    await refreshSiteForecast(db, site, { baseUrl: fake.url, nowMs: () => longAgo + HOUR })
    await refreshSiteForecast(db, site, { baseUrl: fake.url, nowMs: () => NOW })
    const rows = db.select().from(forecasts).all()
    expect(rows.map(r => r.status)).toEqual(['ok', 'http-error'])
    const state = loadSiteForecast(db, site.id, NOW)
    expect(state.state).toBe('stale')
    expect(state.latest!.fetchedAt).toBe(new Date(longAgo).toISOString())
  })

  it('says so when no forecast service is configured, and stores nothing', async () => {
    const { db, site } = freshSite()
    expect(await refreshSiteForecast(db, site, { baseUrl: '' })).toMatchObject({ refreshed: false, status: 'not-configured' })
    expect(db.select().from(forecasts).all()).toEqual([])
    expect(loadSiteForecast(db, site.id, NOW)).toEqual({ state: 'none', latest: null, lastAttempt: null })
  })
})

function forecastState(state: SiteForecastState['state'], fetchedAt: string, hours: [string, number, number][]): SiteForecastState {
  return {
    state,
    latest: { id: 1, source: 'fake.test', fetchedAt, hours: hours.map(([at, t, w]) => ({ at, temperatureC: t, windKmh: w, gustKmh: null })) },
    lastAttempt: { at: fetchedAt, status: 'ok', source: 'fake.test' }
  }
}

describe('weather over a shift window', () => {
  const start = Date.parse('2026-12-01T09:00:00Z')
  const end = start + 2 * HOUR
  const window = { startMs: start, endMs: end, bands: [{ kind: 'night' as const, startMs: start, endMs: end }], timezone: ZONE }
  const hours: [string, number, number][] = [['2026-12-01T09:00:00.000Z', -28, 10], ['2026-12-01T10:00:00.000Z', -30, 20], ['2026-12-01T11:00:00.000Z', -29, 15]]

  it('uses a fresh forecast covering the window and names its fetch time in the site zone', () => {
    const weather = describeWindowWeather(forecastState('fresh', '2026-12-01T06:00:00.000Z', hours), [], window)
    expect(weather.basis).toBe('forecast')
    expect(weather.label).toBe('Forecast fetched at Tue 1 Dec 07:00 UTC+01:00 from fake.test')
    expect(weather.figures).toMatchObject({ samples: 3, coldestTemperatureC: -30, strongestWindKmh: 20 })
  })

  it('marks a stale forecast as stale, with its fetch time', () => {
    const weather = describeWindowWeather(forecastState('stale', '2026-11-30T06:00:00.000Z', hours), [], window)
    expect(weather.forecast.state).toBe('stale')
    expect(weather.label).toBe('Forecast stale, fetched at Mon 30 Nov 07:00 UTC+01:00')
    expect(weather.figures).not.toBeNull()
  })

  it('says "No forecast" when there is none, with no figures, and names a failed last fetch', () => {
    const none: SiteForecastState = { state: 'none', latest: null, lastAttempt: { at: '2026-12-01T08:00:00.000Z', status: 'timeout', source: 'fake.test' } }
    const weather = describeWindowWeather(none, [], window)
    expect(weather).toMatchObject({ basis: 'none', figures: null })
    expect(weather.label).toBe('No forecast; last fetch failed (timeout) at Tue 1 Dec 09:00 UTC+01:00')
  })

  it('says the forecast does not cover these hours, and falls back on site readings', () => {
    const later = describeWindowWeather(forecastState('fresh', '2026-12-01T06:00:00.000Z', hours), [], { ...window, startMs: start + 10 * HOUR, endMs: end + 10 * HOUR })
    expect(later).toMatchObject({ basis: 'none', label: 'No forecast for these hours (the forecast runs to Tue 1 Dec 12:00 UTC+01:00)', forecast: { state: 'not-covered' } })
    const readings = [{ id: 1, at: '2026-12-01T08:00:00.000Z', temperatureC: -33, windKmh: 12, source: 'manual' as const }]
    const fallback = describeWindowWeather({ state: 'none', latest: null, lastAttempt: null }, readings, window)
    expect(fallback).toMatchObject({ basis: 'observations', observations: { count: 1 }, figures: { coldestTemperatureC: -33 } })
    expect(fallback.label).toBe('No forecast; 1 site reading from Tue 1 Dec 09:00 UTC+01:00')
  })
})

describe('site readings', () => {
  it('converts imperial readings to metric (0 °F = −17.8 °C; 10 mph = 16.1 km/h)', () => {
    const checked = convertObservationInput({ at: '2026-12-01T08:00', temperature: 0, wind: 10, units: 'imperial' }, ZONE, NOW)
    expect(checked.ok && checked.row.temperatureC).toBeCloseTo(-17.78, 2)
    expect(checked.ok && checked.row.windKmh).toBeCloseTo(16.09, 2)
    // a local time is read in the site's zone (UTC+01:00 in December)
    expect(checked.ok && new Date(checked.row.atMs).toISOString()).toBe('2026-12-01T07:00:00.000Z')
  })

  it('refuses out-of-range values and times more than 72 hours ahead, naming the field', () => {
    expect(convertObservationInput({ at: '2026-12-01T08:00:00Z', temperature: -95, wind: 5, units: 'metric' }, ZONE, NOW)).toMatchObject({ ok: false, field: 'temperature' })
    expect(convertObservationInput({ at: '2026-12-01T08:00:00Z', temperature: -20, wind: 900, units: 'metric' }, ZONE, NOW)).toMatchObject({ ok: false, field: 'wind' })
    // a forecast relayed from the field may cover the hours ahead (DESIGN.md, readings from the field)
    expect(convertObservationInput({ at: '2026-12-02T08:00:00Z', temperature: -20, wind: 5, units: 'metric' }, ZONE, NOW)).toMatchObject({ ok: true })
    expect(convertObservationInput({ at: '2026-12-04T10:31:00Z', temperature: -20, wind: 5, units: 'metric' }, ZONE, NOW)).toMatchObject({ ok: false, field: 'at' })
  })

  it('reads a CSV of readings and stores them with one audit entry', () => {
    const { db, site, person } = freshSite()
    const parsed = parseObservationCsv('time,temperature,wind\n2026-12-01T06:00,-31.5,18\n\n2026-12-01T07:00:00Z,-32,22\n', 'metric', ZONE, NOW)
    expect(parsed.issues).toEqual([])
    expect(parsed.rows.map(r => new Date(r.atMs).toISOString())).toEqual(['2026-12-01T05:00:00.000Z', '2026-12-01T07:00:00.000Z'])
    insertSiteObservations(db, person.id, site.id, parsed.rows, 'csv')
    expect(loadSiteObservations(db, site.id, 0, NOW).map(r => r.temperatureC)).toEqual([-31.5, -32])
    expect(db.select().from(auditLog).all()).toMatchObject([{ action: 'observation.import', detail: { count: 2 } }])
  })

  it('refuses a whole CSV for one bad row, naming row and column', () => {
    const parsed = parseObservationCsv('time,temperature,wind\n2026-12-01T06:00,-31,18\n2026-12-01T07:00,cold,18\n2026-12-01T08:00,-30,-4\n', 'metric', ZONE, NOW)
    expect(parsed.rows).toEqual([])
    expect(parsed.issues.map(i => i.field)).toEqual(['csv.row3.temperature', 'csv.row4.wind'])
  })

  it('names the missing columns of a CSV header', () => {
    expect(parseObservationCsv('when,temp\n2026-12-01T06:00,-31\n', 'metric', ZONE, NOW).issues[0]!.message).toContain('needs columns time, wind')
    expect(parseObservationCsv('time,temperature,wind\n', 'metric', ZONE, NOW).issues[0]!.message).toContain('no readings')
  })

  it('writes no reading when its audit entry cannot be written (one transaction)', () => {
    const { db, site, person } = freshSite()
    // the readings insert succeeds, then the audit entry's actor fails its foreign key: all is rolled back
    expect(() => insertSiteObservations(db, person.id + 99, site.id, [{ atMs: NOW - HOUR, temperatureC: -20, windKmh: 5 }, { atMs: NOW, temperatureC: -21, windKmh: 6 }], 'manual')).toThrow()
    expect(db.select().from(observations).all()).toEqual([])
    expect(db.select().from(auditLog).all()).toEqual([])
  })
})
