// Hourly weather forecast client for an API in the open Open-Meteo forecast shape, and the
// summaries shifts need from it. Pure TypeScript on the global fetch: no framework imports.
// It never throws: every failure comes back as { ok: false, reason, message }.
import { z } from 'zod'
import { classifyFrostbiteRisk, computeWindChill } from '../core/cold/index'
import type { FrostbiteRisk } from '../core/cold/index'
import { nowDate } from '../core/time/clock'
import { findLowestBy, findWindowExtremes } from '../../shared/weather-window'

const HOUR_MS = 3_600_000
const DEFAULT_FORECAST_TIMEOUT_MS = 5000
// Open-Meteo serves at most 16 forecast days.
const MAX_FORECAST_DAYS = 16
// Sanity bounds on a reply: values outside them mean the reply is not what we asked for.
const PLAUSIBLE_TEMPERATURE_C = { min: -100, max: 70 }
const PLAUSIBLE_WIND_KMH = { max: 500 }
// Open-Meteo reports visibility in metres; a few tens of kilometres at most in practice.
const PLAUSIBLE_VISIBILITY_M = { max: 200_000 }

export interface ForecastHour {
  /** Start of the hour, ISO 8601 in UTC. */
  at: string
  temperatureC: number | null
  windKmh: number | null
  gustKmh: number | null
  /** Horizontal visibility in metres; absent in forecasts stored before it was asked for. */
  visibilityM?: number | null
}

export type ForecastFailureReason = 'timeout' | 'http-error' | 'malformed' | 'network' | 'invalid-request'

export type ForecastResult
  = | { ok: true, source: string, fetchedAt: string, latitude: number, longitude: number, hours: ForecastHour[] }
    | { ok: false, reason: ForecastFailureReason, message: string }

export interface ForecastRequest {
  baseUrl: string
  latitude: number
  longitude: number
  days: number
  timeoutMs?: number
  fetchImpl?: typeof fetch
}

const nullableNumber = (min: number, max: number) => z.number().min(min).max(max).nullable()

const ForecastReplySchema = z.object({
  latitude: z.number().min(-90).max(90),
  longitude: z.number().min(-180).max(180),
  // We ask for timezone=UTC; any other offset would shift every hour.
  utc_offset_seconds: z.literal(0).optional(),
  hourly_units: z.object({
    temperature_2m: z.literal('°C'),
    wind_speed_10m: z.literal('km/h'),
    wind_gusts_10m: z.literal('km/h'),
    // Optional so a reply (or a stored forecast) without visibility still reads.
    visibility: z.literal('m').optional()
  }),
  hourly: z.object({
    time: z.array(z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/)),
    temperature_2m: z.array(nullableNumber(PLAUSIBLE_TEMPERATURE_C.min, PLAUSIBLE_TEMPERATURE_C.max)),
    wind_speed_10m: z.array(nullableNumber(0, PLAUSIBLE_WIND_KMH.max)),
    wind_gusts_10m: z.array(nullableNumber(0, PLAUSIBLE_WIND_KMH.max)),
    visibility: z.array(nullableNumber(0, PLAUSIBLE_VISIBILITY_M.max)).optional()
  }).refine(
    h => [h.temperature_2m, h.wind_speed_10m, h.wind_gusts_10m, h.visibility ?? h.time].every(a => a.length === h.time.length),
    { error: 'hourly arrays differ in length' }
  )
})

function describeFirstIssue(error: z.ZodError): string {
  const issue = error.issues[0]
  if (!issue) return 'reply does not match the forecast shape'
  const path = issue.path.length > 0 ? issue.path.join('.') : 'reply'
  return `${path}: ${issue.message}`
}

function buildForecastUrl(request: ForecastRequest): URL {
  // Keep any path prefix of the base URL (a proxy may serve the API below a folder).
  const url = new URL(`${request.baseUrl.replace(/\/+$/, '')}/v1/forecast`)
  url.searchParams.set('latitude', String(request.latitude))
  url.searchParams.set('longitude', String(request.longitude))
  url.searchParams.set('hourly', 'temperature_2m,wind_speed_10m,wind_gusts_10m,visibility')
  url.searchParams.set('wind_speed_unit', 'kmh')
  url.searchParams.set('timezone', 'UTC')
  url.searchParams.set('forecast_days', String(request.days))
  return url
}

function checkForecastRequest(request: ForecastRequest): string | null {
  if (!Number.isFinite(request.latitude) || Math.abs(request.latitude) > 90) return 'latitude must be between -90 and 90'
  if (!Number.isFinite(request.longitude) || Math.abs(request.longitude) > 180) return 'longitude must be between -180 and 180'
  if (!Number.isInteger(request.days) || request.days < 1 || request.days > MAX_FORECAST_DAYS) {
    return `days must be a whole number from 1 to ${MAX_FORECAST_DAYS}`
  }
  const timeoutMs = request.timeoutMs ?? DEFAULT_FORECAST_TIMEOUT_MS
  if (!Number.isFinite(timeoutMs) || timeoutMs <= 0) return 'timeoutMs must be a positive number'
  try {
    const base = new URL(request.baseUrl)
    if (base.protocol !== 'http:' && base.protocol !== 'https:') return 'baseUrl must be an http or https URL'
  } catch {
    return 'baseUrl must be a valid URL'
  }
  return null
}

type FetchTextResult = { ok: true, text: string } | { ok: false, reason: ForecastFailureReason, message: string }

// The timer covers the whole exchange, body included: a server that sends headers and then stalls
// must time out too.
async function fetchTextWithTimeout(url: URL, timeoutMs: number, fetchImpl: typeof fetch): Promise<FetchTextResult> {
  const controller = new AbortController()
  const timer = setTimeout(() => controller.abort(), timeoutMs)
  try {
    const response = await fetchImpl(url, { signal: controller.signal, headers: { accept: 'application/json' } })
    const text = await response.text()
    if (!response.ok) {
      return { ok: false, reason: 'http-error', message: `forecast service answered HTTP ${response.status}${summariseErrorBody(text)}` }
    }
    return { ok: true, text }
  } catch (error) {
    if (controller.signal.aborted) {
      return { ok: false, reason: 'timeout', message: `forecast service did not answer within ${timeoutMs} ms` }
    }
    const cause = error instanceof Error ? (error.cause instanceof Error ? error.cause.message : error.message) : String(error)
    return { ok: false, reason: 'network', message: `forecast service unreachable: ${cause}` }
  } finally {
    clearTimeout(timer)
  }
}

// Open-Meteo explains a refusal as { error: true, reason }; pass that on when it is there.
function summariseErrorBody(text: string): string {
  try {
    const body = JSON.parse(text) as { reason?: unknown }
    return typeof body.reason === 'string' ? `: ${body.reason.slice(0, 200)}` : ''
  } catch {
    return ''
  }
}

function parseForecastReply(text: string): { ok: true, reply: z.infer<typeof ForecastReplySchema> } | { ok: false, message: string } {
  let body: unknown
  try {
    body = JSON.parse(text)
  } catch {
    return { ok: false, message: 'reply is not JSON' }
  }
  const parsed = ForecastReplySchema.safeParse(body)
  if (!parsed.success) return { ok: false, message: describeFirstIssue(parsed.error) }
  return { ok: true, reply: parsed.data }
}

function convertReplyToHours(hourly: z.infer<typeof ForecastReplySchema>['hourly']): ForecastHour[] | string {
  const hours: ForecastHour[] = []
  let previousMs = -Infinity
  for (let i = 0; i < hourly.time.length; i++) {
    // With timezone=UTC the API writes local wall time without an offset: it is UTC.
    const ms = Date.parse(`${hourly.time[i]}Z`)
    if (!Number.isFinite(ms)) return `hourly.time.${i}: not a valid time`
    if (ms <= previousMs) return `hourly.time.${i}: times are not in increasing order`
    previousMs = ms
    hours.push({
      at: new Date(ms).toISOString(),
      temperatureC: hourly.temperature_2m[i] ?? null,
      windKmh: hourly.wind_speed_10m[i] ?? null,
      gustKmh: hourly.wind_gusts_10m[i] ?? null,
      visibilityM: hourly.visibility?.[i] ?? null
    })
  }
  return hours
}

/** Fetches an hourly forecast (temperature, wind, gusts at 10 m, visibility, UTC); never throws. */
export async function fetchHourlyForecast(request: ForecastRequest): Promise<ForecastResult> {
  try {
    const problem = checkForecastRequest(request)
    if (problem) return { ok: false, reason: 'invalid-request', message: problem }
    const timeoutMs = request.timeoutMs ?? DEFAULT_FORECAST_TIMEOUT_MS
    const fetched = await fetchTextWithTimeout(buildForecastUrl(request), timeoutMs, request.fetchImpl ?? fetch)
    if (!fetched.ok) return fetched
    const parsed = parseForecastReply(fetched.text)
    if (!parsed.ok) return { ok: false, reason: 'malformed', message: `forecast reply malformed: ${parsed.message}` }
    const hours = convertReplyToHours(parsed.reply.hourly)
    if (typeof hours === 'string') return { ok: false, reason: 'malformed', message: `forecast reply malformed: ${hours}` }
    return {
      ok: true,
      source: new URL(request.baseUrl).host,
      fetchedAt: nowDate().toISOString(),
      latitude: parsed.reply.latitude,
      longitude: parsed.reply.longitude,
      hours
    }
  } catch (error) {
    // Last guard for the never-throws promise; nothing above is expected to land here.
    return { ok: false, reason: 'network', message: `forecast request failed: ${error instanceof Error ? error.message : String(error)}` }
  }
}

export interface ForecastWindowSummary {
  /** Instants of the first and last forecast hours used (the ones bracketing the window). */
  firstHourAt: string
  lastHourAt: string
  hoursUsed: number
  coldestTemperatureC: number
  strongestWindKmh: number
  /** Null when the forecast gives no gust figure for these hours. */
  strongestGustKmh: number | null
  /** Worst (coldest) wind chill from sustained wind, as the index uses; null where it is not defined in any hour. */
  worstWindChill: { exactC: number, roundedC: number, at: string, frostbite: FrostbiteRisk } | null
}

// The hours from the last one at or before the window's start to the first one at or after its end:
// values between hours are unknown, so both neighbours count (the cautious reading).
function selectHoursForWindow(hours: ForecastHour[], startMs: number, endMs: number): ForecastHour[] | null {
  const timed = hours.map(hour => ({ hour, ms: Date.parse(hour.at) })).sort((a, b) => a.ms - b.ms)
  let first = -1
  let last = -1
  timed.forEach((t, i) => {
    if (t.ms <= startMs) first = i
    if (last === -1 && t.ms >= endMs) last = i
  })
  if (first === -1 || last === -1) return null
  const slice = timed.slice(first, last + 1)
  const hasGap = slice.some((t, i) => i > 0 && t.ms - slice[i - 1]!.ms > HOUR_MS)
  return hasGap ? null : slice.map(t => t.hour)
}

function findWorstWindChill(hours: ForecastHour[]): ForecastWindowSummary['worstWindChill'] {
  const worst = findLowestBy(hours, hour => computeWindChill(hour.temperatureC!, hour.windKmh!, 'metric').exact)
  if (!worst) return null
  const chill = computeWindChill(worst.sample.temperatureC!, worst.sample.windKmh!, 'metric')
  return { exactC: worst.value, roundedC: chill.rounded!, at: worst.sample.at, frostbite: classifyFrostbiteRisk(worst.value) }
}

/** Summarises the forecast over [startMs, endMs]: coldest, windiest, worst wind chill; null when not covered. */
export function summariseForecastForWindow(hours: ForecastHour[], startMs: number, endMs: number): ForecastWindowSummary | null {
  if (!Number.isFinite(startMs) || !Number.isFinite(endMs) || endMs < startMs) return null
  const used = selectHoursForWindow(hours, startMs, endMs)
  // An hour without temperature or wind leaves the window's coldest or windiest moment unknown.
  if (!used || used.some(h => h.temperatureC === null || h.windKmh === null)) return null
  return {
    firstHourAt: used[0]!.at,
    lastHourAt: used[used.length - 1]!.at,
    hoursUsed: used.length,
    ...findWindowExtremes(used)!,
    worstWindChill: findWorstWindChill(used)
  }
}

/** Tells whether a forecast fetched at fetchedAt is older than maxAgeHours at nowMs; an unreadable time counts as stale. */
export function isForecastStale(fetchedAt: string | number | Date, nowMs: number, maxAgeHours = 6): boolean {
  const fetchedMs = fetchedAt instanceof Date ? fetchedAt.getTime() : typeof fetchedAt === 'number' ? fetchedAt : Date.parse(fetchedAt)
  if (!Number.isFinite(fetchedMs) || !Number.isFinite(nowMs)) return true
  return nowMs - fetchedMs > maxAgeHours * HOUR_MS
}
