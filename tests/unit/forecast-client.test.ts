import { createServer } from 'node:net'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { fetchHourlyForecast } from '../../server/adapters/forecast'
import { computeFakeWeather, startFakeForecastServer } from '../../scripts/fake-forecast.mjs'

// Every request here goes to the local fake on 127.0.0.1 or to a stubbed fetch: no test reaches the network.
const NOW_MS = Date.parse('2026-12-01T10:30:00Z')
// An invented site at 78.2°N, 15.6°E (demo scenario coordinates).
const SITE = { latitude: 78.2, longitude: 15.6 }

let fake: Awaited<ReturnType<typeof startFakeForecastServer>>

beforeAll(async () => {
  fake = await startFakeForecastServer({ port: 0, now: () => NOW_MS })
})

afterEach(() => {
  fake.setMode('normal')
})

afterAll(async () => {
  await fake.close()
})

async function findClosedPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>(resolve => server.listen(0, '127.0.0.1', () => resolve()))
  const address = server.address()
  const port = typeof address === 'object' && address ? address.port : 0
  await new Promise<void>(resolve => server.close(() => resolve()))
  return port
}

function stubFetch(body: unknown, status = 200): typeof fetch {
  return async () => new Response(typeof body === 'string' ? body : JSON.stringify(body), { status })
}

function validReply() {
  return {
    latitude: 78.2,
    longitude: 15.6,
    utc_offset_seconds: 0,
    hourly_units: { time: 'iso8601', temperature_2m: '°C', wind_speed_10m: 'km/h', wind_gusts_10m: 'km/h', visibility: 'm' as string | undefined },
    hourly: {
      time: ['2026-12-01T00:00', '2026-12-01T01:00'],
      temperature_2m: [-25.1, null],
      wind_speed_10m: [20.4, 22],
      wind_gusts_10m: [30, null],
      visibility: [8400, null] as (number | null)[] | undefined
    }
  }
}

describe('fetchHourlyForecast against the local fake forecast server', () => {
  it('parses a normal reply into UTC hours', async () => {
    const result = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 2, timeoutMs: 2000 })
    expect(result.ok).toBe(true)
    if (!result.ok) return
    expect(result.source).toBe(new URL(fake.url).host)
    expect(Number.isFinite(Date.parse(result.fetchedAt))).toBe(true)
    expect(result.hours).toHaveLength(48)
    expect(result.hours[0]!.at).toBe('2026-12-01T00:00:00.000Z')
    expect(result.hours[47]!.at).toBe('2026-12-02T23:00:00.000Z')
    const noon = computeFakeWeather(SITE.latitude, SITE.longitude, Date.parse('2026-12-01T12:00:00Z'))
    expect(result.hours[12]).toEqual({ at: '2026-12-01T12:00:00.000Z', temperatureC: noon.temperatureC, windKmh: noon.windKmh, gustKmh: noon.gustKmh, visibilityM: noon.visibilityM })
  })

  it('serves a deterministic, plausible visibility in metres', async () => {
    const first = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 2, timeoutMs: 2000 })
    const again = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 2, timeoutMs: 2000 })
    expect(first.ok && again.ok).toBe(true)
    if (!first.ok || !again.ok) return
    const visibilities = first.hours.map(h => h.visibilityM)
    expect(again.hours.map(h => h.visibilityM)).toEqual(visibilities)
    // Plausible: whole metres between 50 m and 24 km (invented series; the bounds are this fake's own).
    for (const v of visibilities) {
      expect(Number.isInteger(v)).toBe(true)
      expect(v).toBeGreaterThanOrEqual(50)
      expect(v).toBeLessThanOrEqual(24_000)
    }
    expect(new Set(visibilities).size).toBeGreaterThan(1)
  })

  it('asks for temperature, wind and gusts in km/h and visibility, in UTC, for the number of days', async () => {
    const seen: URL[] = []
    const recordingFetch: typeof fetch = (input, init) => {
      seen.push(new URL(String(input)))
      return fetch(input, init)
    }
    await fetchHourlyForecast({ baseUrl: `${fake.url}/`, ...SITE, days: 3, timeoutMs: 2000, fetchImpl: recordingFetch })
    const url = seen[0]!
    expect(url.pathname).toBe('/v1/forecast')
    expect(url.searchParams.get('hourly')).toBe('temperature_2m,wind_speed_10m,wind_gusts_10m,visibility')
    expect(url.searchParams.get('wind_speed_unit')).toBe('kmh')
    expect(url.searchParams.get('timezone')).toBe('UTC')
    expect(url.searchParams.get('forecast_days')).toBe('3')
    expect(url.searchParams.get('latitude')).toBe('78.2')
  })

  it('gives up with reason timeout when the server never answers', async () => {
    fake.setMode('slow')
    const result = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 150 })
    expect(result).toMatchObject({ ok: false, reason: 'timeout' })
    if (!result.ok) expect(result.message).toContain('150 ms')
  }, 10_000)

  it('reports a non-JSON reply as malformed', async () => {
    fake.setMode('garbage')
    expect(await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 2000 })).toMatchObject({ ok: false, reason: 'malformed' })
  })

  it('reports JSON of the wrong shape as malformed', async () => {
    fake.setMode('malformed')
    expect(await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 2000 })).toMatchObject({ ok: false, reason: 'malformed' })
  })

  it('reports HTTP 500 as http-error with the status', async () => {
    fake.setMode('error')
    const result = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 2000 })
    expect(result).toMatchObject({ ok: false, reason: 'http-error' })
    if (!result.ok) expect(result.message).toContain('500')
  })

  it('reports an unreachable port as network', async () => {
    const port = await findClosedPort()
    const result = await fetchHourlyForecast({ baseUrl: `http://127.0.0.1:${port}`, ...SITE, days: 1, timeoutMs: 2000 })
    expect(result).toMatchObject({ ok: false, reason: 'network' })
  })
})

describe('fetchHourlyForecast reply checks (stubbed fetch)', () => {
  const request = { baseUrl: 'http://forecast.test', ...SITE, days: 1, timeoutMs: 1000 }

  it('keeps null values as null', async () => {
    const result = await fetchHourlyForecast({ ...request, fetchImpl: stubFetch(validReply()) })
    expect(result.ok && result.hours[1]).toEqual({ at: '2026-12-01T01:00:00.000Z', temperatureC: null, windKmh: 22, gustKmh: null, visibilityM: null })
  })

  it('reads visibility in metres into visibilityM', async () => {
    const result = await fetchHourlyForecast({ ...request, fetchImpl: stubFetch(validReply()) })
    expect(result.ok && result.hours.map(h => h.visibilityM)).toEqual([8400, null])
  })

  it('still reads a reply without visibility, leaving visibilityM null', async () => {
    const reply = validReply()
    delete reply.hourly.visibility
    delete reply.hourly_units.visibility
    const result = await fetchHourlyForecast({ ...request, fetchImpl: stubFetch(reply) })
    expect(result.ok && result.hours.map(h => [h.temperatureC, h.visibilityM])).toEqual([[-25.1, null], [null, null]])
  })

  it.each([
    ['arrays of different lengths', (r: ReturnType<typeof validReply>) => { r.hourly.wind_speed_10m.pop() }],
    ['a text where a number belongs', (r: ReturnType<typeof validReply>) => { (r.hourly.temperature_2m as unknown[])[0] = '-25' }],
    ['wind in mph instead of km/h', (r: ReturnType<typeof validReply>) => { r.hourly_units.wind_speed_10m = 'mp/h' }],
    ['temperature in °F', (r: ReturnType<typeof validReply>) => { r.hourly_units.temperature_2m = '°F' }],
    ['a non-UTC offset', (r: ReturnType<typeof validReply>) => { r.utc_offset_seconds = 3600 }],
    ['negative wind', (r: ReturnType<typeof validReply>) => { r.hourly.wind_speed_10m[0] = -3 }],
    ['negative visibility', (r: ReturnType<typeof validReply>) => { r.hourly.visibility![0] = -1 }],
    ['visibility in feet instead of metres', (r: ReturnType<typeof validReply>) => { r.hourly_units.visibility = 'ft' }],
    ['a visibility array of another length', (r: ReturnType<typeof validReply>) => { r.hourly.visibility!.pop() }],
    ['times out of order', (r: ReturnType<typeof validReply>) => { r.hourly.time.reverse() }],
    ['an unreadable time', (r: ReturnType<typeof validReply>) => { r.hourly.time[0] = 'tomorrow' }],
    ['no hourly block', (r: ReturnType<typeof validReply>) => { delete (r as Partial<typeof r>).hourly }]
  ])('reports %s as malformed', async (_name, spoil) => {
    const reply = validReply()
    spoil(reply)
    expect(await fetchHourlyForecast({ ...request, fetchImpl: stubFetch(reply) })).toMatchObject({ ok: false, reason: 'malformed' })
  })

  it('passes on the service\'s own reason with an HTTP error', async () => {
    const result = await fetchHourlyForecast({ ...request, fetchImpl: stubFetch({ error: true, reason: 'Latitude out of range' }, 400) })
    expect(result).toMatchObject({ ok: false, reason: 'http-error' })
    if (!result.ok) expect(result.message).toContain('Latitude out of range')
  })

  it('never throws, even when fetch itself throws synchronously', async () => {
    const throwingFetch = (() => { throw new TypeError('boom') }) as unknown as typeof fetch
    expect(await fetchHourlyForecast({ ...request, fetchImpl: throwingFetch })).toMatchObject({ ok: false, reason: 'network' })
  })

  it.each([
    [{ latitude: 91 }, 'latitude'],
    [{ longitude: -181 }, 'longitude'],
    [{ days: 0 }, 'days'],
    [{ days: 17 }, 'days'],
    [{ timeoutMs: 0 }, 'timeoutMs'],
    [{ baseUrl: 'not a url' }, 'baseUrl']
  ])('refuses a bad request %o without calling fetch', async (change, field) => {
    let called = false
    const spyFetch: typeof fetch = async () => { called = true; return new Response('{}') }
    const result = await fetchHourlyForecast({ ...request, ...change, fetchImpl: spyFetch })
    expect(result).toMatchObject({ ok: false, reason: 'invalid-request' })
    if (!result.ok) expect(result.message).toContain(field)
    expect(called).toBe(false)
  })
})

describe('the fake forecast server itself', () => {
  it('gives the same forecast for the same place and hours', async () => {
    const first = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 2000 })
    const second = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 1, timeoutMs: 2000 })
    expect(first.ok && second.ok).toBe(true)
    if (first.ok && second.ok) expect(second.hours).toEqual(first.hours)
  })

  it('is cold and windy at 78°N in December (its design target: about −20 to −35 °C)', async () => {
    const result = await fetchHourlyForecast({ baseUrl: fake.url, ...SITE, days: 7, timeoutMs: 2000 })
    if (!result.ok) throw new Error(result.message)
    const temps = result.hours.map(h => h.temperatureC!)
    expect(Math.max(...temps)).toBeLessThan(-15)
    expect(Math.min(...temps)).toBeGreaterThan(-45)
    expect(Math.max(...result.hours.map(h => h.windKmh!))).toBeGreaterThan(20)
  })

  it('picks a mode per request from the fake_mode query parameter', async () => {
    const reply = await fetch(`${fake.url}/v1/forecast?latitude=1&longitude=1&fake_mode=error`)
    expect(reply.status).toBe(500)
    expect(fake.getMode()).toBe('normal')
  })

  it('answers 400 without coordinates, as the real service does', async () => {
    const reply = await fetch(`${fake.url}/v1/forecast?hourly=temperature_2m`)
    expect(reply.status).toBe(400)
    expect(await reply.json()).toMatchObject({ error: true })
  })

  it('refuses an unknown mode', () => {
    expect(() => fake.setMode('sideways')).toThrow(/mode/)
  })
})
