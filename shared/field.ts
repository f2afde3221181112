// The field day, shared by server and client: the outing of a shift (trip out, time on site, trip
// back), the field board's shapes, the operator's weather holds and the wording that goes with them.
// Pure: no Vue or Nitro imports.
import { formatLocalTime } from './format'
import { formatTemperature, formatVisibility, formatWind, type FigureUnits } from './units'

const MINUTE_MS = 60_000

/** Every alert and hold says this: the tool reminds, people and procedures decide. */
export const FIELD_DEFERENCE_LINE = 'Gloamline reminds; it does not decide. Your operator\'s procedures, local rules and the people on site decide what to do, and an alert is no rescue plan: follow your own search and response procedure.'

export interface OutingTimes {
  leaveMs: number
  startMs: number
  endMs: number
  backMs: number
}

/** The outing of a shift: leave = start − travel, back = end + travel. */
export function computeOutingTimes(start: string | number, end: string | number, travelMinutes: number): OutingTimes {
  const startMs = typeof start === 'number' ? start : Date.parse(start)
  const endMs = typeof end === 'number' ? end : Date.parse(end)
  const travelMs = Math.max(0, travelMinutes) * MINUTE_MS
  return { leaveMs: startMs - travelMs, startMs, endMs, backMs: endMs + travelMs }
}

/**
 * `leave 08:30, on site 10:00–13:00, back 14:30` in the given zone; with no travel, `on site 10:00–13:00`.
 */
export function describeOuting(start: string | number, end: string | number, travelMinutes: number, timeZone: string): string {
  const t = computeOutingTimes(start, end, travelMinutes)
  const onSite = `on site ${formatLocalTime(t.startMs, timeZone)}–${formatLocalTime(t.endMs, timeZone)}`
  if (travelMinutes <= 0) return onSite
  return `leave ${formatLocalTime(t.leaveMs, timeZone)}, ${onSite}, back ${formatLocalTime(t.backMs, timeZone)}`
}

export const FIELD_STATES = ['out', 'overdue', 'check-in-missed', 'back'] as const
export type FieldState = typeof FIELD_STATES[number]

/** One party on the field board (GET /api/field). */
export interface FieldParty {
  shiftId: number
  outingId: number
  title: string
  siteName: string
  timezone: string
  people: { id: number, name: string }[]
  departedAt: string
  expectedBackAt: string
  lastCheckInAt: string | null
  returnedAt: string | null
  state: FieldState
  /** When the state turned overdue or check-in-missed (null otherwise). */
  alertSince: string | null
  /** The state in words, e.g. "Overdue by 1 h 10 min". */
  words: string
}

export interface FieldSettings {
  overdueGraceMinutes: number
  soloCheckInMinutes: number
  escalateEveryMinutes: number
}

export const DEFAULT_FIELD_SETTINGS: FieldSettings = { overdueGraceMinutes: 30, soloCheckInMinutes: 120, escalateEveryMinutes: 30 }

/** A party's field state in words, for the board and the alert. */
export const FIELD_STATE_WORDS: Record<FieldState, string> = {
  'out': 'Out',
  'overdue': 'Overdue',
  'check-in-missed': 'Check-in missed',
  'back': 'Back'
}

export type { FigureUnits }

/** A hold figure in the person's units: `45 km/h` or `28 mph`, `−46 °C` or `−51 °F`, `200 m` or `656 ft`. */
export function formatHoldFigure(cause: 'windKmh' | 'windChillC' | 'visibilityM', value: number, units: FigureUnits = 'metric'): string {
  if (cause === 'windKmh') return formatWind(value, units)
  if (cause === 'windChillC') return formatTemperature(value, units)
  return formatVisibility(value, units)
}

/** What reached the level, in words: "Wind chill −46 °C (this level: −40 °C or colder)". */
export function describeHoldCause(hold: { cause: 'windKmh' | 'windChillC' | 'visibilityM', value: number, limit: number }, units: FigureUnits = 'metric'): string {
  const v = formatHoldFigure(hold.cause, hold.value, units)
  const l = formatHoldFigure(hold.cause, hold.limit, units)
  if (hold.cause === 'windKmh') return `Wind ${v} (this level: ${l} or more)`
  if (hold.cause === 'windChillC') return `Wind chill ${v} (this level: ${l} or colder)`
  return `Visibility ${v} (this level: ${l} or less)`
}

/** Said with every weather hold. */
export const HOLD_DEFERENCE_LINE = 'The level, its figures and its advice are your operator\'s. A forecast is only a forecast: look at the sky, listen to the people on site, and follow your procedures; where a local rule or your supervisor is stricter, that wins.'
