// Weather at a site: forecasts fetched and stored with their source and fetch time, site readings
// (observations) entered by hand or from CSV, and the weather a shift's window meets.
// A failed fetch is stored as its reason and never replaces the last good forecast.
// Explicit imports only (no auto-imports), so unit tests can use it against a fresh database.
import { and, desc, eq, gte, lt, lte, ne } from 'drizzle-orm'
import Papa from 'papaparse'
import { z } from 'zod'
import { forecasts, observations, type Site } from '../db/schema'
import { COLD_INPUT_LIMITS, COLD_UNITS, type ColdUnits } from '../../shared/cold'
import type { LightPeriodMs } from '../../shared/light'
import { formatDay, formatLocalTime, formatUtcOffset } from '../../shared/format'
import type { AppDatabase } from '../utils/db'
import { useServerConfig, type AppConfig } from '../utils/config'
import { recordAudit } from './audit'
import { convertFahrenheitToCelsius, convertMphToKmh } from '../core/cold/index'
import { fetchHourlyForecast, isForecastStale, summariseForecastForWindow, type ForecastHour } from '../adapters/forecast'
import { summariseColdForWindow, type WeatherSample, type WindowWeather } from '../core/review/queue'
import { InstantSchema } from '../utils/validation'
import { resolveLocalOrInstant } from '../core/time/zoned'
import { nowDate } from '../core/time/clock'
import { realDateTime } from '../../shared/schemas/calendar'

const HOUR_MS = 3_600_000
const DAY_MS = 86_400_000
/** Forecast days asked for: the most the forecast API serves. */
export const SITE_FORECAST_DAYS = 16
/** A forecast older than this is shown as stale. */
export const SITE_FORECAST_STALE_HOURS = 6
// Failed attempts and superseded forecasts are kept this long, then pruned (the last good one always stays).
const FORECAST_KEEP_MS = 7 * DAY_MS
// Readings this long before a shift still describe its start (a reading is a moment, not a forecast).
const OBSERVATION_LEAD_MS = 3 * HOUR_MS
// A reading may be for the hours ahead too: a forecast relayed from the field by radio or satellite
// message. It is kept for at most this far ahead (the longest a field party plans a trip on).
export const OBSERVATION_AHEAD_MAX_HOURS = 72
const OBSERVATION_FUTURE_SLACK_MS = OBSERVATION_AHEAD_MAX_HOURS * HOUR_MS
export const MAX_OBSERVATION_ROWS = 5000

export interface SiteForecastState {
  state: 'fresh' | 'stale' | 'none'
  latest: { id: number, source: string, fetchedAt: string, hours: ForecastHour[] } | null
  lastAttempt: { at: string, status: string, source: string } | null
}

export interface ForecastRefreshOutcome {
  refreshed: boolean
  status: string
  message: string
  at: string
}

/** Where forecasts come from and how long a fetch may take (FORECAST_BASE_URL, FORECAST_TIMEOUT_MS). */
export function readForecastSettings(config: Pick<AppConfig, 'forecastBaseUrl' | 'forecastTimeoutMs'> = useServerConfig()) {
  return { baseUrl: config.forecastBaseUrl, timeoutMs: config.forecastTimeoutMs }
}

/** Fetches a forecast for a site and stores it, or stores why it failed; the last good one is kept. */
export async function refreshSiteForecast(
  db: AppDatabase,
  site: Pick<Site, 'id' | 'latitude' | 'longitude'>,
  options: { baseUrl: string, timeoutMs?: number, fetchImpl?: typeof fetch, nowMs?: () => number, actorId?: number | null }
): Promise<ForecastRefreshOutcome> {
  const now = options.nowMs ?? Date.now
  if (!options.baseUrl) return { refreshed: false, status: 'not-configured', message: 'No forecast service is configured (FORECAST_BASE_URL).', at: new Date(now()).toISOString() }
  const result = await fetchHourlyForecast({ baseUrl: options.baseUrl, latitude: site.latitude, longitude: site.longitude, days: SITE_FORECAST_DAYS, timeoutMs: options.timeoutMs, fetchImpl: options.fetchImpl })
  const atMs = result.ok ? Date.parse(result.fetchedAt) : now()
  const source = result.ok ? result.source : describeSource(options.baseUrl)
  db.transaction((tx) => {
    tx.insert(forecasts).values({ siteId: site.id, source, status: result.ok ? 'ok' : result.reason, fetchedAt: new Date(atMs), hours: result.ok ? result.hours : [] }).run()
    pruneSiteForecasts(tx, site.id, atMs)
    if (options.actorId !== undefined) recordAudit(tx, options.actorId, 'forecast.refresh', 'site', site.id, { status: result.ok ? 'ok' : result.reason })
  })
  return result.ok
    ? { refreshed: true, status: 'ok', message: `${result.hours.length} forecast hours stored`, at: new Date(atMs).toISOString() }
    : { refreshed: false, status: result.reason, message: result.message, at: new Date(atMs).toISOString() }
}

function describeSource(baseUrl: string): string {
  try {
    return new URL(baseUrl).host
  } catch {
    return 'unknown'
  }
}

// Drops rows older than the keep period, except the newest good forecast (it may be all there is).
function pruneSiteForecasts(tx: Pick<AppDatabase, 'select' | 'delete'>, siteId: number, nowMs: number) {
  const good = tx.select({ id: forecasts.id }).from(forecasts).where(and(eq(forecasts.siteId, siteId), eq(forecasts.status, 'ok')))
    .orderBy(desc(forecasts.fetchedAt), desc(forecasts.id)).get()
  const old = and(eq(forecasts.siteId, siteId), lt(forecasts.fetchedAt, new Date(nowMs - FORECAST_KEEP_MS)))
  tx.delete(forecasts).where(good ? and(old, ne(forecasts.id, good.id)) : old).run()
}

/** The newest good forecast of a site, the newest attempt (which may have failed), and whether it is fresh. */
export function loadSiteForecast(db: Pick<AppDatabase, 'select'>, siteId: number, nowMs: number): SiteForecastState {
  const good = db.select().from(forecasts).where(and(eq(forecasts.siteId, siteId), eq(forecasts.status, 'ok')))
    .orderBy(desc(forecasts.fetchedAt), desc(forecasts.id)).get()
  const attempt = db.select({ fetchedAt: forecasts.fetchedAt, status: forecasts.status, source: forecasts.source }).from(forecasts)
    .where(eq(forecasts.siteId, siteId)).orderBy(desc(forecasts.fetchedAt), desc(forecasts.id)).get()
  const lastAttempt = attempt ? { at: attempt.fetchedAt.toISOString(), status: attempt.status, source: attempt.source } : null
  if (!good) return { state: 'none', latest: null, lastAttempt }
  return {
    state: isForecastStale(good.fetchedAt, nowMs, SITE_FORECAST_STALE_HOURS) ? 'stale' : 'fresh',
    latest: { id: good.id, source: good.source, fetchedAt: good.fetchedAt.toISOString(), hours: good.hours },
    lastAttempt
  }
}

export interface ObservationRow {
  id: number
  at: string
  temperatureC: number
  windKmh: number
  visibilityM?: number | null
  source: 'manual' | 'csv'
  /** When the reading was entered: one entered after the forecast was fetched wins over it. */
  enteredAt?: string
}

/** Site readings with `at` in [fromMs, toMs], oldest first. */
export function loadSiteObservations(db: Pick<AppDatabase, 'select'>, siteId: number, fromMs: number, toMs: number): ObservationRow[] {
  return db.select().from(observations)
    .where(and(eq(observations.siteId, siteId), gte(observations.at, new Date(fromMs)), lte(observations.at, new Date(toMs))))
    .orderBy(observations.at, observations.id).all()
    .map(r => ({ id: r.id, at: r.at.toISOString(), temperatureC: r.temperatureC, windKmh: r.windKmh, visibilityM: r.visibilityM, source: r.source, enteredAt: r.createdAt.toISOString() }))
}

// --- entering readings ----------------------------------------------------------------------

const ReadingTimeSchema = z.union([
  InstantSchema,
  realDateTime(z.string().regex(/^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2})?$/))
], { error: 'expected an ISO 8601 instant, or a local time YYYY-MM-DDTHH:mm in the site\'s zone' })

const readingNumber = (field: string) => z.union([z.number(), z.string().trim().min(1, `${field} is required`)], { error: `${field} must be a number` })
  .transform(Number).pipe(z.number({ error: `${field} must be a number` }).refine(Number.isFinite, `${field} must be a number`))

/** One reading as entered: air temperature and wind at 10 m in the given units, at a time. */
export const ObservationInputSchema = z.object({
  at: ReadingTimeSchema,
  temperature: readingNumber('temperature'),
  wind: readingNumber('wind'),
  // metres (metric) or feet (imperial); optional: not every party can judge it
  visibility: z.number({ error: 'visibility must be a number' }).min(0, 'visibility must be 0 or more').max(330_000, 'visibility is out of range').nullable().optional(),
  units: z.enum(COLD_UNITS, { error: 'units must be metric or imperial' }).default('metric')
})
export type ObservationInput = z.infer<typeof ObservationInputSchema>

/** Checks a reading's range and time against the site; returns the metric row or the field and message at fault. */
export function convertObservationInput(input: ObservationInput, timezone: string, nowMs: number): { ok: true, row: { atMs: number, temperatureC: number, windKmh: number, visibilityM: number | null } } | { ok: false, field: string, message: string } {
  const limits = COLD_INPUT_LIMITS[input.units as ColdUnits]
  const unit = input.units === 'imperial' ? { t: '°F', w: 'mph' } : { t: '°C', w: 'km/h' }
  if (input.temperature < limits.minTemperature || input.temperature > limits.maxTemperature) {
    return { ok: false, field: 'temperature', message: `must be between ${limits.minTemperature} and ${limits.maxTemperature} ${unit.t}` }
  }
  if (input.wind < 0 || input.wind > limits.maxWind) return { ok: false, field: 'wind', message: `must be between 0 and ${limits.maxWind} ${unit.w}` }
  const atMs = resolveLocalOrInstant(input.at.replace(' ', 'T'), timezone).ms
  if (!Number.isFinite(atMs)) return { ok: false, field: 'at', message: 'not a valid time' }
  if (atMs > nowMs + OBSERVATION_FUTURE_SLACK_MS) return { ok: false, field: 'at', message: `a reading may be at most ${OBSERVATION_AHEAD_MAX_HOURS} hours ahead` }
  const imperial = input.units === 'imperial'
  const visibilityM = input.visibility == null ? null : imperial ? input.visibility * 0.3048 : input.visibility
  return { ok: true, row: { atMs, temperatureC: imperial ? convertFahrenheitToCelsius(input.temperature) : input.temperature, windKmh: imperial ? convertMphToKmh(input.wind) : input.wind, visibilityM } }
}

/** Stores readings for a site with one audit entry, all in one transaction; returns the stored rows. */
export function insertSiteObservations(db: AppDatabase, actorId: number, siteId: number, rows: { atMs: number, temperatureC: number, windKmh: number, visibilityM?: number | null }[], source: 'manual' | 'csv'): ObservationRow[] {
  return db.transaction((tx) => {
    const stored = rows.length
      ? tx.insert(observations).values(rows.map(r => ({ siteId, at: new Date(r.atMs), temperatureC: round1(r.temperatureC), windKmh: round1(r.windKmh), visibilityM: r.visibilityM == null ? null : Math.round(r.visibilityM), source, createdBy: actorId, createdAt: nowDate() }))).returning().all()
      : []
    recordAudit(tx, actorId, source === 'csv' ? 'observation.import' : 'observation.create', 'site', siteId, { count: stored.length, ids: stored.map(r => r.id).slice(0, 50) })
    return stored.map(r => ({ id: r.id, at: r.at.toISOString(), temperatureC: r.temperatureC, windKmh: r.windKmh, source: r.source }))
  })
}

function round1(value: number) {
  return Math.round(value * 10) / 10
}

// --- the weather a window meets ---------------------------------------------------------------

function describeFetchTime(iso: string, timezone: string): string {
  return `${formatDay(iso, timezone)} ${formatLocalTime(iso, timezone)} ${formatUtcOffset(iso, timezone)}`
}

function forecastSamples(hours: ForecastHour[], startMs: number, endMs: number): WeatherSample[] | null {
  const summary = summariseForecastForWindow(hours, startMs, endMs)
  if (!summary) return null
  const from = Date.parse(summary.firstHourAt)
  const to = Date.parse(summary.lastHourAt)
  return hours.map(h => ({ atMs: Date.parse(h.at), temperatureC: h.temperatureC!, windKmh: h.windKmh!, gustKmh: h.gustKmh }))
    .filter(s => s.atMs >= from && s.atMs <= to)
}

/** The weather over a shift: from a forecast that covers it (fresh or marked stale), else site readings, else none. */
export function describeWindowWeather(
  forecast: SiteForecastState,
  readings: ObservationRow[],
  window: { startMs: number, endMs: number, bands: LightPeriodMs[], timezone: string }
): WindowWeather {
  const { startMs, endMs, bands, timezone } = window
  const inWindow = readings.filter(r => Date.parse(r.at) >= startMs - OBSERVATION_LEAD_MS && Date.parse(r.at) <= endMs)
  const observationsInfo = { count: inWindow.length, first: inWindow[0]?.at ?? null, last: inWindow[inWindow.length - 1]?.at ?? null }
  const forecastOnly = forecast.latest ? forecastSamples(forecast.latest.hours, startMs, endMs) : null
  const samples = forecastOnly && forecast.latest ? preferNewerReadings(forecastOnly, inWindow, Date.parse(forecast.latest.fetchedAt)) : forecastOnly
  const forecastInfo = {
    state: forecast.latest && !samples ? 'not-covered' as const : forecast.state,
    fetchedAt: forecast.latest?.fetchedAt ?? null,
    source: forecast.latest?.source ?? null,
    lastAttempt: forecast.lastAttempt ? { at: forecast.lastAttempt.at, status: forecast.lastAttempt.status } : null
  }
  const failedNote = forecast.lastAttempt && forecast.lastAttempt.status !== 'ok'
    ? `; last fetch failed (${forecast.lastAttempt.status}) at ${describeFetchTime(forecast.lastAttempt.at, timezone)}`
    : ''
  if (samples && samples.length) {
    const when = describeFetchTime(forecast.latest!.fetchedAt, timezone)
    const label = forecast.state === 'stale' ? `Forecast stale, fetched at ${when}` : `Forecast fetched at ${when} from ${forecast.latest!.source}`
    return { basis: 'forecast', label: label + failedNote, forecast: forecastInfo, observations: observationsInfo, figures: summariseColdForWindow(samples, bands, timezone) }
  }
  const lastHour = forecast.latest?.hours.at(-1)?.at
  const gap = forecastInfo.state === 'not-covered'
    ? `No forecast for these hours${lastHour ? ` (the forecast runs to ${describeFetchTime(lastHour, timezone)})` : ''}`
    : 'No forecast'
  if (inWindow.length) {
    const readingSamples = inWindow.map(r => ({ atMs: Date.parse(r.at), temperatureC: r.temperatureC, windKmh: r.windKmh, gustKmh: null }))
    const label = `${gap}; ${inWindow.length} site reading${inWindow.length === 1 ? '' : 's'} from ${describeFetchTime(inWindow[0]!.at, timezone)}`
    return { basis: 'observations', label: label + failedNote, forecast: forecastInfo, observations: observationsInfo, figures: summariseColdForWindow(readingSamples, bands, timezone) }
  }
  return { basis: 'none', label: gap + failedNote, forecast: forecastInfo, observations: observationsInfo, figures: null }
}

// A reading entered after the forecast was fetched is newer word for the hour it falls in: it takes
// that hour's place (a measured −28 °C on site beats an older forecast of −20 °C).
function preferNewerReadings(samples: WeatherSample[], readings: ObservationRow[], fetchedMs: number): WeatherSample[] {
  const newer = readings.filter(r => r.enteredAt !== undefined && Date.parse(r.enteredAt) > fetchedMs)
  if (!newer.length) return samples
  const byHour = new Map(newer.map(r => [Math.floor(Date.parse(r.at) / HOUR_MS), r]))
  return samples.map((s) => {
    const r = byHour.get(Math.floor(s.atMs / HOUR_MS))
    return r ? { atMs: s.atMs, temperatureC: r.temperatureC, windKmh: r.windKmh, gustKmh: null } : s
  })
}

// --- CSV of readings ----------------------------------------------------------------------------

const CSV_COLUMNS = { at: ['time', 'at', 'timestamp'], temperature: ['temperature', 'temp', 'air_temperature'], wind: ['wind', 'wind_speed', 'windspeed'] } as const

export interface ObservationCsvIssue { field: string, message: string }

/**
 * Reads a CSV of readings (a header row naming time, temperature and wind; units for the whole file).
 * Every row is checked before anything is stored: one bad row refuses the file, naming row and column.
 */
export function parseObservationCsv(text: string, units: ColdUnits, timezone: string, nowMs: number): { rows: { atMs: number, temperatureC: number, windKmh: number }[], issues: ObservationCsvIssue[] } {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' })
  // A one-column file has no delimiter to detect; the header check below explains that case better.
  const errors = parsed.errors.filter(e => e.type !== 'Delimiter')
  if (errors.length) {
    const e = errors[0]!
    return { rows: [], issues: [{ field: 'csv', message: `line ${(e.row ?? 0) + 1}: ${e.message}` }] }
  }
  const [header, ...lines] = parsed.data.filter(line => line.some(cell => cell.trim() !== ''))
  if (!header) return { rows: [], issues: [{ field: 'csv', message: 'the file is empty' }] }
  const names = header.map(h => h.trim().toLowerCase())
  const index = Object.fromEntries(Object.entries(CSV_COLUMNS).map(([key, aliases]) => [key, names.findIndex(n => (aliases as readonly string[]).includes(n))])) as Record<keyof typeof CSV_COLUMNS, number>
  const missing = (Object.keys(index) as (keyof typeof CSV_COLUMNS)[]).filter(k => index[k] === -1)
  if (missing.length) return { rows: [], issues: [{ field: 'csv', message: `the header row needs columns ${missing.map(k => CSV_COLUMNS[k][0]).join(', ')} (found: ${names.join(', ') || 'none'})` }] }
  if (!lines.length) return { rows: [], issues: [{ field: 'csv', message: 'the file has a header but no readings' }] }
  if (lines.length > MAX_OBSERVATION_ROWS) return { rows: [], issues: [{ field: 'csv', message: `at most ${MAX_OBSERVATION_ROWS} readings per file` }] }
  const rows: { atMs: number, temperatureC: number, windKmh: number }[] = []
  const issues: ObservationCsvIssue[] = []
  lines.forEach((line, i) => {
    const rowNumber = i + 2
    const input = ObservationInputSchema.safeParse({ at: line[index.at]?.trim(), temperature: line[index.temperature], wind: line[index.wind], units })
    if (!input.success) {
      const issue = input.error.issues[0]!
      issues.push({ field: `csv.row${rowNumber}.${String(issue.path[0] ?? 'row')}`, message: issue.message })
      return
    }
    const checked = convertObservationInput(input.data, timezone, nowMs)
    if (checked.ok) rows.push(checked.row)
    else issues.push({ field: `csv.row${rowNumber}.${checked.field}`, message: checked.message })
  })
  return { rows: issues.length ? [] : rows, issues }
}

// --- hourly weather with readings from the field ----------------------------------------------

/** One hour of weather at a site, from the forecast or from a reading that is newer than it. */
export interface SiteWeatherHour {
  atMs: number
  temperatureC: number | null
  windKmh: number | null
  visibilityM: number | null
  source: 'forecast' | 'reading'
}

/**
 * The site's hourly weather: the newest good forecast's hours, where a site reading entered after
 * that forecast was fetched replaces the forecast for the hour it falls in (a measurement on site,
 * or a forecast relayed from the field, is newer word than the forecast); readings in hours the
 * forecast does not cover add those hours. Readings from two days back onwards are considered.
 */
export function loadSiteHourlyWeather(db: Pick<AppDatabase, 'select'>, siteId: number, nowMs: number): SiteWeatherHour[] {
  const forecast = loadSiteForecast(db, siteId, nowMs).latest
  const fetchedMs = forecast ? Date.parse(forecast.fetchedAt) : -Infinity
  const hours = new Map<number, SiteWeatherHour>()
  for (const h of forecast?.hours ?? []) {
    const atMs = Date.parse(h.at)
    hours.set(atMs, { atMs, temperatureC: h.temperatureC, windKmh: h.windKmh, visibilityM: h.visibilityM ?? null, source: 'forecast' })
  }
  const readings = db.select().from(observations)
    .where(and(eq(observations.siteId, siteId), gte(observations.at, new Date(nowMs - 2 * DAY_MS))))
    .orderBy(observations.createdAt, observations.id).all()
  for (const r of readings) {
    const hourMs = Math.floor(r.at.getTime() / HOUR_MS) * HOUR_MS
    const existing = hours.get(hourMs)
    if (existing?.source === 'forecast' && r.createdAt.getTime() <= fetchedMs) continue
    hours.set(hourMs, { atMs: hourMs, temperatureC: r.temperatureC, windKmh: r.windKmh, visibilityM: r.visibilityM ?? null, source: 'reading' })
  }
  return [...hours.values()].sort((a, b) => a.atMs - b.atMs)
}
