// A local stand-in for an hourly forecast API in the open Open-Meteo shape, for tests and the demo.
// Forecasts are invented but deterministic: the same coordinates and hour always give the same values.
// Plain Node (no dependencies). Run directly: `node scripts/fake-forecast.mjs` listens on
// FORECAST_FAKE_PORT (default 3055; a free port when that one is taken) on 127.0.0.1 and prints its URL.
import { createServer } from 'node:http'
import { pathToFileURL } from 'node:url'

const HOUR_MS = 3_600_000
const DAY_MS = 86_400_000
const MAX_FORECAST_DAYS = 16
const DEFAULT_FORECAST_DAYS = 7

/** Answer modes: normal, slow (never answers), garbage (not JSON), malformed (JSON of the wrong shape), error (HTTP 500). */
export const FAKE_FORECAST_MODES = ['normal', 'slow', 'garbage', 'malformed', 'error']

const HOURLY_VARIABLES = ['temperature_2m', 'wind_speed_10m', 'wind_gusts_10m', 'visibility']
const HOURLY_UNIT_LABELS = { temperature_2m: '°C', visibility: 'm' }
const WIND_UNITS = { kmh: { label: 'km/h', factor: 1 }, ms: { label: 'm/s', factor: 1 / 3.6 }, mph: { label: 'mp/h', factor: 1 / 1.609344 }, kn: { label: 'kn', factor: 1 / 1.852 } }

// 32-bit integer hash of a string (FNV-1a followed by a murmur-style finaliser): a reproducible seed.
function hashText(text) {
  let h = 0x811c9dc5
  for (let i = 0; i < text.length; i++) {
    h = Math.imul(h ^ text.charCodeAt(i), 0x01000193)
  }
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b)
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35)
  return (h ^ (h >>> 16)) >>> 0
}

// Pseudo-random value in [-1, 1] for a place, a channel and a knot in time.
function noiseAt(latitude, longitude, channel, knot) {
  const key = `${Math.round(latitude * 100)}:${Math.round(longitude * 100)}:${channel}:${knot}`
  return hashText(key) / 0xffffffff * 2 - 1
}

// Smooth noise: knots every `spacingHours`, cosine-interpolated in between.
function smoothNoise(latitude, longitude, channel, hourIndex, spacingHours) {
  const position = hourIndex / spacingHours
  const knot = Math.floor(position)
  const t = (1 - Math.cos((position - knot) * Math.PI)) / 2
  return noiseAt(latitude, longitude, channel, knot) * (1 - t) + noiseAt(latitude, longitude, channel, knot + 1) * t
}

function dayOfYear(ms) {
  const date = new Date(ms)
  return (ms - Date.UTC(date.getUTCFullYear(), 0, 1)) / DAY_MS
}

function roundTenth(value) {
  return Math.round(value * 10) / 10
}

/**
 * Invented weather for one place and hour: colder towards the poles and in their winter, windier there.
 * At 78°N on 1 December it gives about −25 to −34 °C. Visibility (metres, to the nearest 10) wanders
 * between a few kilometres and 24 km and falls steeply as wind rises past 30 km/h (drifting snow).
 * @param {number} latitude
 * @param {number} longitude
 * @param {number} ms start of the hour, epoch milliseconds
 * @returns {{ temperatureC: number, windKmh: number, gustKmh: number, visibilityM: number }}
 */
export function computeFakeWeather(latitude, longitude, ms) {
  const hourIndex = Math.floor(ms / HOUR_MS)
  const lat2 = latitude * latitude
  const summerC = 30 - 0.0045 * lat2
  const winterC = 28 - 0.0105 * lat2
  // +1 in the local hemisphere's deepest winter (early February in the north).
  const winterness = Math.cos(2 * Math.PI * (dayOfYear(ms) - 35) / 365.25) * (latitude >= 0 ? 1 : -1)
  const seasonalC = (summerC + winterC) / 2 - (summerC - winterC) / 2 * winterness
  const solarHour = ((new Date(ms).getUTCHours() + longitude / 15) % 24 + 24) % 24
  const dailySwing = 4 * Math.cos(latitude * Math.PI / 180) * (1 - 0.5 * winterness)
  const dailyC = dailySwing * Math.cos(2 * Math.PI * (solarHour - 15) / 24)
  const weatherC = 5 * smoothNoise(latitude, longitude, 'temperature', hourIndex, 12)
  const baseWindKmh = 8 + 0.2 * Math.abs(latitude) + 6 * Math.max(0, winterness)
  const windKmh = Math.max(0, baseWindKmh * (1 + 0.6 * smoothNoise(latitude, longitude, 'wind', hourIndex, 6)))
  const gustKmh = windKmh * (1.35 + 0.15 * noiseAt(latitude, longitude, 'gust', hourIndex)) + 2
  const clearness = (smoothNoise(latitude, longitude, 'visibility', hourIndex, 8) + 1) / 2
  const drift = Math.min(1, Math.max(0, (windKmh - 30) / 40))
  const visibilityM = Math.max(50, 24_000 * (0.15 + 0.85 * clearness) * (1 - 0.95 * drift))
  return {
    temperatureC: roundTenth(seasonalC + dailyC + weatherC),
    windKmh: roundTenth(windKmh),
    gustKmh: roundTenth(gustKmh),
    visibilityM: Math.round(visibilityM / 10) * 10
  }
}

function readNumber(params, name, min, max) {
  const raw = params.get(name)
  if (raw === null || raw.trim() === '') return { error: `Parameter '${name}' is required.` }
  const value = Number(raw)
  if (!Number.isFinite(value) || value < min || value > max) return { error: `Parameter '${name}' must be between ${min} and ${max}.` }
  return { value }
}

function readDate(params, name) {
  const raw = params.get(name)
  if (raw === null) return { value: null }
  const ms = /^\d{4}-\d{2}-\d{2}$/.test(raw) ? Date.parse(`${raw}T00:00:00Z`) : NaN
  return Number.isFinite(ms) ? { value: ms } : { error: `Parameter '${name}' must be a date YYYY-MM-DD.` }
}

// Reads the query the way the real service does, for the parts this fake supports.
function readForecastQuery(params, nowMs) {
  const latitude = readNumber(params, 'latitude', -90, 90)
  const longitude = readNumber(params, 'longitude', -180, 180)
  const days = params.has('forecast_days') ? readNumber(params, 'forecast_days', 0, MAX_FORECAST_DAYS) : { value: DEFAULT_FORECAST_DAYS }
  const startDate = readDate(params, 'start_date')
  const endDate = readDate(params, 'end_date')
  const failed = [latitude, longitude, days, startDate, endDate].find(p => p.error)
  if (failed) return { error: failed.error }
  const hourly = (params.get('hourly') ?? '').split(',').filter(Boolean)
  const unknown = hourly.find(v => !HOURLY_VARIABLES.includes(v))
  if (unknown) return { error: `This fake forecast does not know the hourly variable '${unknown}'.` }
  const timezone = params.get('timezone') ?? 'GMT'
  if (!['UTC', 'GMT'].includes(timezone)) return { error: 'This fake forecast serves timezone=UTC only.' }
  const windUnit = params.get('wind_speed_unit') ?? 'kmh'
  if (!WIND_UNITS[windUnit]) return { error: `Parameter 'wind_speed_unit' must be one of ${Object.keys(WIND_UNITS).join(', ')}.` }
  const todayMs = Math.floor(nowMs / DAY_MS) * DAY_MS
  const startMs = startDate.value ?? todayMs
  const endMs = endDate.value !== null ? endDate.value + DAY_MS : startMs + Math.round(days.value) * DAY_MS
  if (endMs <= startMs || endMs - startMs > MAX_FORECAST_DAYS * DAY_MS) return { error: 'The requested date range is empty or longer than 16 days.' }
  return { latitude: latitude.value, longitude: longitude.value, hourly, windUnit, startMs, endMs }
}

/**
 * Builds the forecast reply body for a query, as the real service shapes it (timezone UTC).
 * @param {URLSearchParams} params
 * @param {number} nowMs
 * @returns {{ status: number, body: object }}
 */
export function buildFakeForecastReply(params, nowMs) {
  const query = readForecastQuery(params, nowMs)
  if (query.error) return { status: 400, body: { error: true, reason: query.error } }
  const wind = WIND_UNITS[query.windUnit]
  const hourlyUnits = { time: 'iso8601' }
  const hourly = { time: [] }
  for (const name of query.hourly) {
    hourlyUnits[name] = HOURLY_UNIT_LABELS[name] ?? wind.label
    hourly[name] = []
  }
  for (let ms = query.startMs; ms < query.endMs; ms += HOUR_MS) {
    const weather = computeFakeWeather(query.latitude, query.longitude, ms)
    hourly.time.push(new Date(ms).toISOString().slice(0, 16))
    if (hourly.temperature_2m) hourly.temperature_2m.push(weather.temperatureC)
    if (hourly.wind_speed_10m) hourly.wind_speed_10m.push(roundTenth(weather.windKmh * wind.factor))
    if (hourly.wind_gusts_10m) hourly.wind_gusts_10m.push(roundTenth(weather.gustKmh * wind.factor))
    if (hourly.visibility) hourly.visibility.push(weather.visibilityM)
  }
  const body = {
    latitude: query.latitude,
    longitude: query.longitude,
    generationtime_ms: 0.1,
    utc_offset_seconds: 0,
    timezone: 'GMT',
    timezone_abbreviation: 'GMT',
    elevation: 0,
    ...(query.hourly.length > 0 ? { hourly_units: hourlyUnits, hourly } : {})
  }
  return { status: 200, body }
}

function sendJson(res, status, body) {
  const text = JSON.stringify(body)
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(text) })
  res.end(text)
}

function answerInMode(mode, url, res, nowMs) {
  if (mode === 'garbage') {
    res.writeHead(200, { 'content-type': 'text/html' })
    res.end('<html><body>Service temporarily replaced by a teapot</body></html>')
    return
  }
  if (mode === 'error') {
    sendJson(res, 500, { error: true, reason: 'The fake forecast was told to fail.' })
    return
  }
  const reply = buildFakeForecastReply(url.searchParams, nowMs)
  if (mode === 'malformed' && reply.status === 200) {
    // Right envelope, wrong content: a text where a number belongs and arrays of unequal length.
    const hourly = reply.body.hourly ?? { time: [] }
    sendJson(res, 200, { ...reply.body, hourly: { ...hourly, temperature_2m: ['cold', ...(hourly.temperature_2m ?? [])], wind_speed_10m: [] } })
    return
  }
  sendJson(res, reply.status, reply.body)
}

/**
 * Starts the fake forecast server on 127.0.0.1 (port 0 = any free port).
 * The mode comes from setMode(), or per request from the `fake_mode` query parameter or `x-fake-mode` header.
 * @param {{ port?: number, host?: string, mode?: string, now?: () => number }} [options]
 * @returns {Promise<{ url: string, port: number, close: () => Promise<void>, setMode: (mode: string) => void, getMode: () => string, countRequests: () => number }>}
 */
export async function startFakeForecastServer(options = {}) {
  const { port = 0, host = '127.0.0.1', now = Date.now } = options
  let mode = checkFakeMode(options.mode ?? 'normal')
  let requests = 0
  const server = createServer((req, res) => {
    requests++
    const url = new URL(req.url ?? '/', `http://${host}`)
    const requestMode = url.searchParams.get('fake_mode') ?? req.headers['x-fake-mode'] ?? mode
    if (!FAKE_FORECAST_MODES.includes(requestMode)) {
      sendJson(res, 400, { error: true, reason: `Unknown fake mode '${requestMode}'.` })
    } else if (requestMode === 'slow') {
      // Never answer: the socket stays open until the client gives up or the server closes.
    } else if (req.method !== 'GET' || url.pathname !== '/v1/forecast') {
      sendJson(res, 404, { error: true, reason: 'Not found: this fake serves GET /v1/forecast only.' })
    } else {
      answerInMode(requestMode, url, res, now())
    }
  })
  await new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => resolve())
  })
  const address = server.address()
  const boundPort = typeof address === 'object' && address ? address.port : port
  return {
    url: `http://${host}:${boundPort}`,
    port: boundPort,
    setMode: (next) => { mode = checkFakeMode(next) },
    getMode: () => mode,
    countRequests: () => requests,
    close: () => new Promise((resolve) => {
      // Slow-mode requests hold their sockets open; drop them so closing does not wait forever.
      server.closeAllConnections()
      server.close(() => resolve())
    })
  }
}

function checkFakeMode(mode) {
  if (!FAKE_FORECAST_MODES.includes(mode)) {
    throw new RangeError(`mode must be one of ${FAKE_FORECAST_MODES.join(', ')}`)
  }
  return mode
}

async function runStandalone() {
  const { startOnPreferredPort } = await import('./ports.mjs')
  const { service: fake, note } = await startOnPreferredPort('the fake forecast server', Number(process.env.FORECAST_FAKE_PORT ?? 3055), port => startFakeForecastServer({ port }))
  if (note) console.log(note)
  console.log(`Fake forecast server listening at ${fake.url} (GET /v1/forecast)`)
  const stop = () => fake.close().then(() => process.exit(0))
  process.once('SIGINT', stop)
  process.once('SIGTERM', stop)
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runStandalone().catch((error) => {
    console.error(`Fake forecast server failed to start: ${String(error?.message ?? error).split('\n')[0]}`)
    process.exit(1)
  })
}
