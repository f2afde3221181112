// Shapes and small pure helpers of the light outlook (year chart, run-up, light board, slot finder),
// shared by the server routes and the pages. Imports neither Vue nor Nitro.
import type { BandKind, DayStatus, LightPeriod, LightRequirement } from './light'

/** One band of a local day as [kind, startMinute, endMinute], minutes elapsed since local midnight. */
export type CompactPeriod = [BandKind, number, number]

export interface YearChartDay {
  /** Local date, YYYY-MM-DD. */
  date: string
  /** Length of the local day in minutes: 1440, or 1380 / 1500 on a clock change. */
  minutes: number
  periods: CompactPeriod[]
  daylightMinutes: number
  civilLightMinutes: number
  /** Azimuth (degrees from true north, clockwise) of the day's first sunrise, null without one. */
  sunriseAzimuth: number | null
  /** Azimuth of the day's last sunset, null without one. */
  sunsetAzimuth: number | null
  status: DayStatus
}

/** A daylight-saving (or other) change of the zone's offset inside a local day. */
export interface ClockChange {
  date: string
  /** Minutes elapsed since local midnight at which the clocks change. */
  atMinute: number
  fromOffset: string
  toOffset: string
  /** Wall-clock jump in minutes: +60 when clocks go forward, −60 when they go back. */
  shiftMinutes: number
}

export interface SeasonMarker {
  kind: 'march-equinox' | 'june-solstice' | 'september-equinox' | 'december-solstice'
  /** Local date of the instant in the site's zone. */
  date: string
  /** The instant, ISO 8601 with the site's offset. */
  at: string
}

export interface AzimuthExtreme {
  date: string
  azimuth: number
}

export interface YearChartData {
  siteId: number
  year: number
  latitude: number
  longitude: number
  timezone: string
  days: YearChartDay[]
  clockChanges: ClockChange[]
  markers: SeasonMarker[]
  horizon: {
    northernmostSunrise: AzimuthExtreme | null
    southernmostSunrise: AzimuthExtreme | null
    northernmostSunset: AzimuthExtreme | null
    southernmostSunset: AzimuthExtreme | null
  }
}

/** Whether the light is shrinking toward the darkest day or growing away from it. */
export type LightTrend = 'darkening' | 'brightening'

export interface RunupDay {
  date: string
  civilLightMinutes: number
  daylightMinutes: number
  status: DayStatus
}

export interface RunupSummary {
  siteId: number
  timezone: string
  /** The local date the count starts from (today at the site unless asked otherwise). */
  from: string
  minCivilHours: number
  trend: LightTrend
  today: RunupDay
  /** Days from `from` (inclusive) that still have at least minCivilHours of civil light, before it falls below; null when it does not fall below within the horizon. */
  daysLeftWithCivilHours: number | null
  /** First date with less than minCivilHours of civil light after a date with at least that. */
  civilLightFallsBelow: string | null
  /** First date with at least minCivilHours of civil light after a date with less. */
  civilLightReaches: string | null
  /** Last date with a sunrise before the next polar night. */
  lastSunrise: string | null
  /** First date of the next (or current) polar night. */
  polarNightBegins: string | null
  /** First date after that polar night on which the sun rises again. */
  firstSunriseAfterPolarNight: string | null
  /** Days of the current or next polar night, when both ends lie within the horizon. */
  polarNightDays: number | null
  /** First date of the next midnight sun, and the first date after it on which the sun sets again. */
  midnightSunBegins: string | null
  midnightSunEnds: string | null
  /** How many days ahead were searched. */
  horizonDays: number
  /** Civil and daylight minutes of each day from `from`, for the countdown chart. */
  series: RunupDay[]
}

/** Planning presets for "hours of civil light a task needs": our defaults, editable per search. */
export const CIVIL_HOURS_PRESETS = [
  { id: 'short-task', label: 'Short outdoor task', hours: 2 },
  { id: 'standard-task', label: 'Half-day field task', hours: 4 },
  { id: 'long-task', label: 'Full field day', hours: 6 },
  { id: 'extended-task', label: 'Long traverse or lift', hours: 8 }
] as const

export interface BoardDay {
  date: string
  status: DayStatus
  /** The day's bands, for its strip. */
  periods: LightPeriod[]
  sunrise: string | null
  sunset: string | null
  civilDawn: string | null
  civilDusk: string | null
  daylightMinutes: number
  civilLightMinutes: number
  /** Change of civil-light minutes from the day before. */
  civilLightChange: number
  shifts: number
  flaggedShifts: number
}

/** The next change of season at a site, as one short sentence and its date. */
export interface BoardTransition {
  kind: 'polar-night-begins' | 'polar-night-ends' | 'midnight-sun-begins' | 'midnight-sun-ends' | 'civil-falls-below' | 'civil-reaches'
  date: string
  /** Days from today. */
  inDays: number
}

export interface BoardSite {
  siteId: number
  name: string
  latitude: number
  longitude: number
  timezone: string
  /** The zone's offset now, e.g. +01:00. */
  offset: string
  today: BoardDay
  tomorrow: BoardDay
  next: BoardTransition | null
}

export interface BoardData {
  generatedAt: string
  minCivilHours: number
  sites: BoardSite[]
}

export const SLOT_RANKS = ['earliest', 'margin'] as const
export type SlotRank = typeof SLOT_RANKS[number]

export interface ProposedSlot {
  /** ISO 8601 with the site's offset, on a quarter hour. */
  start: string
  end: string
  /** Local date the slot starts on. */
  date: string
  durationMinutes: number
  /** Usable light before the slot starts and left after it ends (the margin to dusk), in minutes; null when the light never ends (requirement `any`, midnight sun). */
  lightBeforeMinutes: number | null
  lightAfterMinutes: number | null
  /** The people the slot is for. */
  assigneeIds: number[]
  assignees: { id: number, name: string }[]
}

export type SlotReasonCode = 'light' | 'unavailable' | 'busy' | 'rest' | 'max-length' | 'past' | null

export interface SlotSearchResult {
  siteId: number
  timezone: string
  requirement: LightRequirement
  rank: SlotRank
  /** Local dates searched; `to` is inclusive. */
  from: string
  to: string
  slots: ProposedSlot[]
  /** Why there is no slot (null when there are slots). */
  reason: string | null
  reasonCode: SlotReasonCode
  /** Days of the window with at least one slot, and days searched. */
  daysWithSlots: number
  daysSearched: number
  /** Minutes of travel each way the slots allow for (the outing lies in the light). */
  travelMinutes?: number
  rules: { minRestHours: number, maxShiftHours: number }
}

/** The part of GET /api/cold the briefing shows. */
export interface BriefingColdFigures {
  windChill: number | null
  frostbite: { label: string }
  warmup: { kind: string, maxWorkMinutes: number | null, breaks: number | null, stopWork: boolean }
  cautions: { key: string, text: string }[]
}

/** A stored forecast as GET /api/sites/:id/forecast gives it (the part the briefing shows). */
export interface BriefingForecastReply {
  state: 'fresh' | 'stale' | 'none'
  latest: { source: string, fetchedAt: string, hours: { at: string, temperatureC: number | null, windKmh: number | null, gustKmh: number | null }[] } | null
}

/** The wall-clock `HH:mm` of an ISO 8601 instant written with its offset (the offset is kept as written). */
export function formatWallTime(iso: string): string {
  return iso.slice(11, 16)
}

/** The offset part of an ISO 8601 instant (`+01:00`; `+00:00` for Z). */
export function offsetOfIso(iso: string): string {
  const match = /([+-]\d{2}:\d{2}|Z)$/.exec(iso)
  return !match || match[1] === 'Z' ? '+00:00' : match[1]!
}

/** `UTC+01:00`, `UTC−07:00`: the offset of an ISO 8601 instant as the app shows it. */
export function formatOffsetLabel(iso: string): string {
  const offset = offsetOfIso(iso)
  return `UTC${offset.startsWith('-') ? '−' : '+'}${offset.slice(1)}`
}

/** `Tue 14 Jan`, or `Tue 14 Jan 2028` when the date falls in another year than `reference`. */
export function formatDateFrom(date: string, reference: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const weekday = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'][new Date(Date.UTC(y, m - 1, d)).getUTCDay()]
  const month = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'][m - 1]
  return `${weekday} ${d} ${month}${date.slice(0, 4) === reference.slice(0, 4) ? '' : ` ${y}`}`
}

/** Whole days from one local date to another (positive when `to` is later). */
export function countDaysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000)
}

/** A day's bands as wall-clock minute spans [kind, from, to] for drawing, split at a clock change. */
export function toWallSegments(periods: CompactPeriod[], change: Pick<ClockChange, 'atMinute' | 'shiftMinutes'> | undefined): CompactPeriod[] {
  if (!change) return periods
  const { atMinute: at, shiftMinutes: shift } = change
  // A band ending at the change ends on the new clock when clocks go forward (no hole for the skipped
  // hour), on the old clock when they go back (the repeated hour is drawn once, by the later band).
  const mapEnd = (m: number) => (m > at || (m === at && shift > 0) ? m + shift : m)
  const out: CompactPeriod[] = []
  for (const [kind, start, end] of periods) {
    if (start < at && end > at) out.push([kind, start, shift > 0 ? at + shift : at], [kind, at + shift, end + shift])
    else out.push([kind, toWallMinute(start, change), mapEnd(end)])
  }
  return out
}

/** Wall-clock minutes since midnight of an ISO 8601 time written in the site's offset; `dayDate` makes the next midnight 1440. */
export function wallMinuteOfIso(iso: string, dayDate: string): number {
  const minutes = Number(iso.slice(11, 13)) * 60 + Number(iso.slice(14, 16)) + Number(iso.slice(17, 19)) / 60
  return iso.slice(0, 10) > dayDate ? 1440 + minutes : minutes
}

/** Maps minutes elapsed since local midnight to the wall clock's minutes, across a clock change. */
export function toWallMinute(elapsed: number, change: Pick<ClockChange, 'atMinute' | 'shiftMinutes'> | undefined): number {
  if (!change || elapsed < change.atMinute) return elapsed
  return elapsed + change.shiftMinutes
}
