// Cold-exposure figures: wind chill, frostbite band, and the 4-hour work/warm-up schedule.
// A pure module (no framework imports): plain inputs, plain outputs, imported explicitly.
import { z } from 'zod'
import { KMH_PER_MPH } from '../../../shared/units'
import {
  COLD_CAUTIONS,
  COLD_INPUT_LIMITS,
  COLD_UNITS,
  COLD_UNIT_SYMBOLS,
  COLD_WORKLOADS,
  FROSTBITE_BANDS,
  WIND_CHILL_LIMITS
} from '../../../shared/cold'
import type {
  ColdCautionKey,
  ColdUnits,
  ColdWorkload,
  FrostbiteRiskKey,
  WarmupScheduleKind,
  WindChillReason
} from '../../../shared/cold'

// Inputs converted between units land a hair off a whole number (e.g. −15.000000000000002);
// this tolerance keeps such values on the whole degree they stand for before rounding toward colder.
const ROUNDING_EPSILON = 1e-9

export interface WindChillResult {
  units: ColdUnits
  /** Whole degrees in the request's units, as the published charts print it; null where undefined. */
  rounded: number | null
  exact: number | null
  reason: WindChillReason | null
}

export interface FrostbiteRisk {
  key: FrostbiteRiskKey
  label: string
  /** The whole-degree wind chill in °C the band was chosen from. */
  wholeDegreeC: number
  minMinutes: number | null
  maxMinutes: number | null
}

export interface WarmupSchedule {
  kind: WarmupScheduleKind
  /** Longest work period in minutes; null = normal breaks; 0 together with stopWork. */
  maxWorkMinutes: number | null
  /** Number of 10-minute warm-up breaks in the 4 hours; null where the table gives none. */
  breaks: number | null
  stopWork: boolean
  workload: ColdWorkload
  /** Table row used (after rounding and the light-work shift); null when warmer than the table. */
  row: { index: number, warmestC: number, coldestC: number | null, label: string } | null
  column: { index: number, windKmh: number, windMph: number, label: string }
  lightWorkShifted: boolean
  windBeyondTable: boolean
  /** True when the table applies and the sun is down or not known to be up (the table assumes sunshine). */
  sunCaution: boolean
  notes: string[]
}

export interface ColdFigures {
  windChill: number | null
  frostbite: FrostbiteRisk & { basis: 'wind-chill' | 'air-temperature' }
  warmup: WarmupSchedule
  units: ColdUnits
  temperature: number
  wind: number
  temperatureC: number
  windKmh: number
  windChillExact: number | null
  windChillReason: WindChillReason | null
  cautions: { key: ColdCautionKey, text: string }[]
}

/** Converts degrees Fahrenheit to degrees Celsius. */
export function convertFahrenheitToCelsius(fahrenheit: number): number {
  return (fahrenheit - 32) * 5 / 9
}

/** Converts miles per hour to kilometres per hour (international mile). */
export function convertMphToKmh(mph: number): number {
  return mph * KMH_PER_MPH
}

// Published charts print whole degrees. An exact half is sent to the colder side, the cautious
// choice for a safety figure (with real inputs an exact half practically never occurs).
function roundWholeDegreeTowardColderOnTie(value: number): number {
  return -Math.round(-value)
}

function assertFiniteInputs(temperature: number, wind: number): void {
  if (!Number.isFinite(temperature)) {
    throw new RangeError('temperature must be a finite number')
  }
  if (!Number.isFinite(wind) || wind < 0) {
    throw new RangeError('wind must be a finite number, zero or more')
  }
}

/** Computes the 2001 North American wind chill index (NWS / ECCC); null with a reason where it is not defined. */
export function computeWindChill(temperature: number, wind: number, units: ColdUnits): WindChillResult {
  assertFiniteInputs(temperature, wind)
  const limits = WIND_CHILL_LIMITS[units]
  if (temperature > limits.maxTemperature) {
    return { units, rounded: null, exact: null, reason: 'too-warm' }
  }
  if (wind <= limits.minWindExclusive) {
    return { units, rounded: null, exact: null, reason: 'too-calm' }
  }
  const v = wind ** 0.16
  // Imperial: WCT = 35.74 + 0.6215·T − 35.75·V^0.16 + 0.4275·T·V^0.16 (°F, mph), NWS 2001.
  // Metric: W = 13.12 + 0.6215·T − 11.37·V^0.16 + 0.3965·T·V^0.16 (°C, km/h at 10 m), ECCC 2001.
  const exact = units === 'imperial'
    ? 35.74 + 0.6215 * temperature - 35.75 * v + 0.4275 * temperature * v
    : 13.12 + 0.6215 * temperature - 11.37 * v + 0.3965 * temperature * v
  return { units, rounded: roundWholeDegreeTowardColderOnTie(exact), exact, reason: null }
}

/** Classifies a wind chill (°C) into the ECCC frostbite band, on its whole-degree value as the table reads. */
export function classifyFrostbiteRisk(windChillC: number): FrostbiteRisk {
  if (!Number.isFinite(windChillC)) {
    throw new RangeError('windChillC must be a finite number')
  }
  const wholeDegreeC = roundWholeDegreeTowardColderOnTie(windChillC)
  const band = FROSTBITE_BANDS.find(b => b.coldestC === null || wholeDegreeC >= b.coldestC)!
  return {
    key: band.key,
    label: band.label,
    wholeDegreeC,
    minMinutes: band.minMinutes,
    maxMinutes: band.maxMinutes
  }
}

type WarmupCell = { maxWorkMinutes: number | null, breaks: number } | 'stop'

const NORMAL: WarmupCell = { maxWorkMinutes: null, breaks: 1 }
const STOP: WarmupCell = 'stop'
const limit = (maxWorkMinutes: number, breaks: number): WarmupCell => ({ maxWorkMinutes, breaks })

// ACGIH TLVs work/warm-up schedule for a 4-hour shift (after the Saskatchewan Department of Labour),
// as reproduced by OSHA and CCOHS: moderate to heavy work, sunny sky, dry clothing. Rows by air
// temperature in whole °C; cells by wind column (none, 8, 16, 24, 32 km/h = none, 5, 10, 15, 20 mph).
const WARMUP_ROWS: readonly { warmestC: number, coldestC: number | null, cells: readonly WarmupCell[] }[] = [
  { warmestC: -26, coldestC: -28, cells: [NORMAL, NORMAL, limit(75, 2), limit(55, 3), limit(40, 4)] },
  { warmestC: -29, coldestC: -31, cells: [NORMAL, limit(75, 2), limit(55, 3), limit(40, 4), limit(30, 5)] },
  { warmestC: -32, coldestC: -34, cells: [limit(75, 2), limit(55, 3), limit(40, 4), limit(30, 5), STOP] },
  { warmestC: -35, coldestC: -37, cells: [limit(55, 3), limit(40, 4), limit(30, 5), STOP, STOP] },
  { warmestC: -38, coldestC: -39, cells: [limit(40, 4), limit(30, 5), STOP, STOP, STOP] },
  { warmestC: -40, coldestC: -42, cells: [limit(30, 5), STOP, STOP, STOP, STOP] },
  { warmestC: -43, coldestC: null, cells: [STOP, STOP, STOP, STOP, STOP] }
]

const WARMUP_WIND_COLUMNS: readonly { windKmh: number, windMph: number, label: string }[] = [
  { windKmh: 0, windMph: 0, label: 'no noticeable wind' },
  { windKmh: 8, windMph: 5, label: '8 km/h (5 mph)' },
  { windKmh: 16, windMph: 10, label: '16 km/h (10 mph)' },
  { windKmh: 24, windMph: 15, label: '24 km/h (15 mph)' },
  { windKmh: 32, windMph: 20, label: '32 km/h (20 mph)' }
]

function formatRowLabel(row: { warmestC: number, coldestC: number | null }): string {
  return row.coldestC === null ? `${row.warmestC} °C and colder` : `${row.warmestC} to ${row.coldestC} °C`
}

// Conservative reading: a temperature between two rows falls in the colder one (−28.4 °C is read as −29 °C).
function findWarmupRowIndex(tempC: number): number {
  const wholeDegree = Math.floor(tempC + ROUNDING_EPSILON)
  return WARMUP_ROWS.findIndex(row => wholeDegree <= row.warmestC && (row.coldestC === null || wholeDegree >= row.coldestC))
}

// Conservative reading: any wind above a column's figure goes to the next column up; only a wind of 0
// counts as "no noticeable wind". Imperial requests are read against the table's own mph columns.
function findWarmupColumn(wind: number, windUnits: 'kmh' | 'mph'): { index: number, beyond: boolean } {
  const key = windUnits === 'mph' ? 'windMph' : 'windKmh'
  const index = WARMUP_WIND_COLUMNS.findIndex(col => wind <= col[key] + ROUNDING_EPSILON)
  return index === -1 ? { index: WARMUP_WIND_COLUMNS.length - 1, beyond: true } : { index, beyond: false }
}

export interface WarmupLookupOptions {
  /** Whether the sun is up at the time; the table assumes a sunny sky. Unknown counts as not up. */
  sunUp?: boolean
  /** Read the wind column in mph (the table's imperial columns) instead of km/h. */
  windColumnUnits?: 'kmh' | 'mph'
}

/** Looks up the ACGIH 4-hour work/warm-up schedule, read conservatively (colder row, next wind column up). */
export function lookupWarmupSchedule(
  tempC: number,
  windKmh: number,
  workload: ColdWorkload = 'moderate-heavy',
  options: WarmupLookupOptions = {}
): WarmupSchedule {
  assertFiniteInputs(tempC, windKmh)
  const windUnits = options.windColumnUnits ?? 'kmh'
  const column = findWarmupColumn(windUnits === 'mph' ? windKmh / KMH_PER_MPH : windKmh, windUnits)
  const baseRow = findWarmupRowIndex(tempC)
  // The table's note: for light work or little movement, use the next colder row.
  const lightWorkShifted = workload === 'light' && baseRow !== -1 && baseRow < WARMUP_ROWS.length - 1
  const rowIndex = lightWorkShifted ? baseRow + 1 : baseRow
  const columnInfo = { index: column.index, ...WARMUP_WIND_COLUMNS[column.index]! }
  const notes = describeWarmupReading(tempC, workload, baseRow, lightWorkShifted, column.beyond, columnInfo.label)
  if (rowIndex === -1) {
    return {
      kind: 'outside-table', maxWorkMinutes: null, breaks: null, stopWork: false, workload, row: null,
      column: columnInfo, lightWorkShifted, windBeyondTable: column.beyond, sunCaution: false, notes
    }
  }
  const row = WARMUP_ROWS[rowIndex]!
  const cell = row.cells[column.index]!
  const sunCaution = options.sunUp !== true
  if (sunCaution) {
    notes.push('The schedule assumes a sunny sky; with the sun down or unknown it may not protect enough.')
  }
  const rowInfo = { index: rowIndex, warmestC: row.warmestC, coldestC: row.coldestC, label: formatRowLabel(row) }
  const shared = { workload, row: rowInfo, column: columnInfo, lightWorkShifted, windBeyondTable: column.beyond, sunCaution, notes }
  if (cell === 'stop') {
    return { kind: 'stop', maxWorkMinutes: 0, breaks: null, stopWork: true, ...shared }
  }
  const kind: WarmupScheduleKind = cell.maxWorkMinutes === null ? 'normal-breaks' : 'limited'
  return { kind, maxWorkMinutes: cell.maxWorkMinutes, breaks: cell.breaks, stopWork: false, ...shared }
}

function describeWarmupReading(
  tempC: number,
  workload: ColdWorkload,
  baseRow: number,
  lightWorkShifted: boolean,
  windBeyond: boolean,
  columnLabel: string
): string[] {
  const notes: string[] = []
  if (baseRow === -1) {
    notes.push('Warmer than the schedule\'s first row (−26 °C): it sets no limit, so normal breaks apply.')
    if (workload === 'light') {
      notes.push('Light work: the schedule shifts light work one row colder only within the table.')
    }
    return notes
  }
  const wholeDegree = Math.floor(tempC + ROUNDING_EPSILON)
  if (Math.abs(wholeDegree - tempC) > ROUNDING_EPSILON) {
    notes.push(`Temperature read toward colder: ${roundForNote(tempC)} °C taken as ${wholeDegree} °C.`)
  }
  if (lightWorkShifted) {
    notes.push('Light work or little movement: the next colder row is used, as the schedule directs.')
  }
  notes.push(`Wind read in the ${columnLabel} column (the next column up).`)
  if (windBeyond) {
    notes.push('Wind above the last column: the last column is used and may not protect enough.')
  }
  notes.push('For dry clothing only, with 10-minute warm-up breaks in a warm place.')
  return notes
}

function roundForNote(value: number): string {
  return String(Math.round(value * 10) / 10)
}

const numberFromQuery = (field: string) => z.preprocess(
  // z.coerce.number() turns '' into 0; an empty query value must be an error, not a figure.
  value => (typeof value === 'string' && value.trim() === '') ? undefined : value,
  z.coerce.number({ error: `${field} must be a number` })
)

/** Validates the GET /api/cold query; every message names its field. */
export const ColdQuerySchema = z.object({
  temperature: numberFromQuery('temperature'),
  wind: numberFromQuery('wind').pipe(z.number().min(0, { error: 'wind must not be negative' })),
  units: z.enum(COLD_UNITS, { error: 'units must be metric or imperial' }).default('metric'),
  workload: z.enum(COLD_WORKLOADS, { error: 'workload must be moderate-heavy or light' }).default('moderate-heavy'),
  sunUp: z.stringbool({ error: 'sunUp must be true or false' }).optional()
}).superRefine((query, ctx) => {
  const limits = COLD_INPUT_LIMITS[query.units]
  const symbols = COLD_UNIT_SYMBOLS[query.units]
  // zod can run this check after a field already failed; without valid units there is no range to apply.
  if (!limits || !symbols) return
  if (query.temperature < limits.minTemperature || query.temperature > limits.maxTemperature) {
    ctx.addIssue({
      code: 'custom',
      path: ['temperature'],
      message: `temperature must be between ${limits.minTemperature} and ${limits.maxTemperature} ${symbols.temperature}`
    })
  }
  if (query.wind > limits.maxWind) {
    ctx.addIssue({ code: 'custom', path: ['wind'], message: `wind must be at most ${limits.maxWind} ${symbols.wind}` })
  }
})
export type ColdQuery = z.infer<typeof ColdQuerySchema>

export interface ColdFiguresInput {
  temperature: number
  wind: number
  units: ColdUnits
  workload?: ColdWorkload
  sunUp?: boolean
}

/** Computes the GET /api/cold figures: wind chill, frostbite band, work/warm-up schedule and the cautions that go with them. */
export function computeColdFigures(input: ColdFiguresInput): ColdFigures {
  const { temperature, wind, units } = input
  const workload = input.workload ?? 'moderate-heavy'
  const temperatureC = units === 'imperial' ? convertFahrenheitToCelsius(temperature) : temperature
  const windKmh = units === 'imperial' ? convertMphToKmh(wind) : wind
  const chill = computeWindChill(temperature, wind, units)
  // Bands are read on the index in °C; where it is not defined, the air temperature itself is banded
  // (what bare skin meets in still or mild air), and the basis says so.
  const chillC = chill.exact === null ? null : (units === 'imperial' ? convertFahrenheitToCelsius(chill.exact) : chill.exact)
  const frostbite = chillC === null
    ? { ...classifyFrostbiteRisk(temperatureC), basis: 'air-temperature' as const }
    : { ...classifyFrostbiteRisk(chillC), basis: 'wind-chill' as const }
  const warmup = lookupWarmupSchedule(temperatureC, windKmh, workload, {
    sunUp: input.sunUp,
    windColumnUnits: units === 'imperial' ? 'mph' : 'kmh'
  })
  return {
    windChill: chill.rounded,
    frostbite,
    warmup,
    units,
    temperature,
    wind,
    temperatureC,
    windKmh,
    windChillExact: chill.exact,
    windChillReason: chill.reason,
    cautions: selectColdCautions(chill.reason !== null, warmup)
  }
}

function selectColdCautions(indexUndefined: boolean, warmup: WarmupSchedule): { key: ColdCautionKey, text: string }[] {
  const keys: ColdCautionKey[] = ['planning-aid', 'exposed-skin-only']
  if (indexUndefined) keys.push('index-not-defined')
  if (warmup.kind === 'outside-table') keys.push('outside-table')
  if (warmup.sunCaution) keys.push('sunshine-assumed')
  if (warmup.windBeyondTable && warmup.kind !== 'outside-table') keys.push('wind-beyond-table')
  keys.push('frostbite-signs', 'hypothermia-signs', 'wet-clothing', 'working-alone', 'warm-shelter')
  return keys.map(key => ({ key, text: COLD_CAUTIONS[key] }))
}
