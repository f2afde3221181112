// Time, date, duration and coordinate formatting shared by every screen (docs/look.md: 24-hour clock,
// dates like `Tue 14 Jan`, durations `3 h 25 min`). Pure: no imports at all, only Intl.

const FORMATTERS = new Map<string, Intl.DateTimeFormat>()
const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat']
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

function partsFormatter(timeZone: string) {
  let f = FORMATTERS.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit',
      hour: '2-digit', minute: '2-digit', second: '2-digit'
    })
    FORMATTERS.set(timeZone, f)
  }
  return f
}

function toMs(value: string | number | Date): number {
  return typeof value === 'number' ? value : typeof value === 'string' ? Date.parse(value) : value.getTime()
}

function wallClockFromIntl(ms: number, timeZone: string): string {
  const parts = Object.fromEntries(partsFormatter(timeZone).formatToParts(ms).map(p => [p.type, p.value]))
  return `${parts.year}-${parts.month}-${parts.day}T${parts.hour}:${parts.minute}:${parts.second}`
}

// Intl costs microseconds a call, and a feed or a list formats thousands of instants. A zone's offset
// is read once per UTC day: when it is the same at both ends of the day it holds all day (no zone
// changes its offset twice within a day and back), and the wall clock is plain arithmetic; a day
// with a change (NaN) asks Intl for every instant.
const DAY_OFFSETS = new Map<string, number>()
const OFFSET_DAY_MS = 86_400_000

function offsetFromIntl(ms: number, timeZone: string): number {
  return Date.parse(`${wallClockFromIntl(ms, timeZone)}Z`) - ms
}

function steadyDayOffset(ms: number, timeZone: string): number {
  const day = Math.floor(ms / OFFSET_DAY_MS)
  const key = `${timeZone}|${day}`
  let offset = DAY_OFFSETS.get(key)
  if (offset === undefined) {
    const start = offsetFromIntl(day * OFFSET_DAY_MS, timeZone)
    offset = start === offsetFromIntl((day + 1) * OFFSET_DAY_MS - 1000, timeZone) ? start : NaN
    if (DAY_OFFSETS.size >= 20_000) DAY_OFFSETS.clear()
    DAY_OFFSETS.set(key, offset)
  }
  return offset
}

/** The wall clock of an instant in a zone, as `YYYY-MM-DDTHH:mm:ss` without offset. */
export function toWallClock(value: string | number | Date, timeZone: string): string {
  const ms = Math.floor(toMs(value) / 1000) * 1000
  const offset = Number.isFinite(ms) ? steadyDayOffset(ms, timeZone) : NaN
  if (Number.isNaN(offset)) return wallClockFromIntl(ms, timeZone)
  const wall = new Date(ms + offset)
  const year = wall.getUTCFullYear()
  // outside years 0–9999 the ISO form differs: leave those to Intl
  if (year < 1000 || year > 9999) return wallClockFromIntl(ms, timeZone)
  return wall.toISOString().slice(0, 19)
}

/**
 * The instant (epoch ms) of a wall-clock time `YYYY-MM-DDTHH:mm[:ss]` in a zone, by the server's rule
 * (server/core/time/zone-table.ts, tested to agree): in an overlap the earlier instant; in a
 * spring-forward gap the offset in force before the gap, so 02:30 in a 02:00→03:00 gap is 03:30.
 */
export function fromWallClock(wall: string, timeZone: string): number {
  const w = wall.length === 16 ? `${wall}:00` : wall
  const asUtc = Date.parse(`${w}Z`)
  // the offsets in force 30 h either side (every zone is within 14 h of UTC): one of them reads this
  // wall clock, unless it is in a gap
  const before = zoneOffsetMinutes(asUtc - 108_000_000, timeZone)
  const after = zoneOffsetMinutes(asUtc + 108_000_000, timeZone)
  const matches = [...new Set([before, after])].map(o => asUtc - o * 60_000)
    .filter(ms => toWallClock(ms, timeZone) === w).sort((a, b) => a - b)
  return matches[0] ?? asUtc - before * 60_000
}

/** The local date `YYYY-MM-DD` of an instant in a zone. */
export function localDateIn(value: string | number | Date, timeZone: string): string {
  return toWallClock(value, timeZone).slice(0, 10)
}

/** Adds whole days to a `YYYY-MM-DD` date. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

/** `14:05`: the 24-hour local time of an instant in a zone. */
export function formatLocalTime(value: string | number | Date, timeZone: string): string {
  return toWallClock(value, timeZone).slice(11, 16)
}

/** `Tue 14 Jan`: the local date of an instant in a zone. */
export function formatDay(value: string | number | Date, timeZone: string): string {
  return formatDate(localDateIn(value, timeZone))
}

/** `Tue 14 Jan` for a plain `YYYY-MM-DD` date. */
export function formatDate(date: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const weekday = new Date(Date.UTC(y, m - 1, d)).getUTCDay()
  return `${WEEKDAYS[weekday]} ${d} ${MONTHS[m - 1]}`
}

/** `3 h 25 min`, `45 min`, `2 h`: a duration in whole minutes. */
export function formatDuration(minutes: number): string {
  const total = Math.round(Math.abs(minutes))
  const h = Math.floor(total / 60)
  const m = total % 60
  if (h === 0) return `${m} min`
  return m === 0 ? `${h} h` : `${h} h ${m} min`
}

/** The zone's offset from UTC at an instant, in minutes (east positive). */
export function zoneOffsetMinutes(value: string | number | Date, timeZone: string): number {
  const ms = Math.floor(toMs(value) / 1000) * 1000
  const wall = toWallClock(ms, timeZone)
  return Math.round((Date.parse(`${wall}Z`) - ms) / 60_000)
}

/** `UTC+01:00`: the zone's offset at an instant. */
export function formatUtcOffset(value: string | number | Date, timeZone: string): string {
  const minutes = zoneOffsetMinutes(value, timeZone)
  const abs = Math.abs(minutes)
  return `UTC${minutes < 0 ? '−' : '+'}${String(Math.floor(abs / 60)).padStart(2, '0')}:${String(abs % 60).padStart(2, '0')}`
}

/** `14:05–17:30 Arctic/Longyearbyen`, with the end's day when it falls on another local date. */
export function formatTimeRange(start: string, end: string, timeZone: string): string {
  const sameDay = localDateIn(start, timeZone) === localDateIn(end, timeZone)
  const endText = sameDay ? formatLocalTime(end, timeZone) : `${formatDay(end, timeZone)} ${formatLocalTime(end, timeZone)}`
  return `${formatLocalTime(start, timeZone)}–${endText} ${timeZone}`
}

// ISO 6709 sign convention: north and east positive.
const HEMISPHERES: Record<string, { axis: 'lat' | 'lon', sign: number }> = {
  N: { axis: 'lat', sign: 1 }, S: { axis: 'lat', sign: -1 }, E: { axis: 'lon', sign: 1 }, W: { axis: 'lon', sign: -1 }
}

/**
 * Reads a coordinate typed as decimal degrees (`-51.72`, `78,2232`) or degrees, minutes and seconds
 * with a hemisphere letter (`78°13′N`, `78 13 24 N`, `N 78 13.4`). Null when it cannot be read, or is
 * out of range for the axis (latitude ±90, longitude ±180), or names the other axis's hemisphere.
 */
export function parseCoordinate(text: string, axis?: 'lat' | 'lon'): number | null {
  let s = text.trim().toUpperCase().replace(/(\d),(\d)/g, '$1.$2').replace(/DEG(REES)?/g, ' ')
  if (!s) return null
  let sign = 1
  const letter = s.match(/[NSEW]/g)
  if (letter) {
    if (letter.length > 1) return null
    const h = HEMISPHERES[letter[0]!]!
    if (axis && h.axis !== axis) return null
    axis = h.axis
    sign = h.sign
    s = s.replace(/[NSEW]/, ' ')
  }
  if (/^\s*[-+−]/.test(s)) {
    if (letter) return null
    if (/^\s*[-−]/.test(s)) sign = -1
    s = s.replace(/^\s*[-+−]/, '')
  }
  const numbers = s.replace(/[°º˚′'’″"]/g, ' ').trim().split(/\s+/).filter(Boolean)
  if (!numbers.length || numbers.length > 3 || !numbers.every(n => /^\d+(\.\d+)?$/.test(n))) return null
  const [deg, min = 0, sec = 0] = numbers.map(Number) as [number, number?, number?]
  if (numbers.length > 1 && !Number.isInteger(deg)) return null
  if (numbers.length > 2 && !Number.isInteger(min)) return null
  if (min >= 60 || sec >= 60) return null
  const value = sign * (deg + min / 60 + sec / 3600)
  const limit = axis === 'lon' ? 180 : axis === 'lat' ? 90 : 180
  return Math.abs(value) > limit ? null : Math.round(value * 1e6) / 1e6
}

/** `78°13′24″ N`: a coordinate in degrees, minutes and whole seconds with its hemisphere. */
export function formatDms(value: number, axis: 'lat' | 'lon'): string {
  const hemisphere = axis === 'lat' ? (value < 0 ? 'S' : 'N') : (value < 0 ? 'W' : 'E')
  let totalSeconds = Math.round(Math.abs(value) * 3600)
  const deg = Math.floor(totalSeconds / 3600)
  totalSeconds -= deg * 3600
  const min = Math.floor(totalSeconds / 60)
  const sec = totalSeconds - min * 60
  return `${deg}°${String(min).padStart(2, '0')}′${String(sec).padStart(2, '0')}″ ${hemisphere}`
}

/** `78.2232° N`: a coordinate as decimal degrees with its hemisphere, to 4 places (about 11 m). */
export function formatDecimalDegrees(value: number, axis: 'lat' | 'lon'): string {
  const hemisphere = axis === 'lat' ? (value < 0 ? 'S' : 'N') : (value < 0 ? 'W' : 'E')
  return `${Math.abs(value).toFixed(4)}° ${hemisphere}`
}
