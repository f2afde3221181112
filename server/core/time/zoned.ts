import { formatInTimeZone, fromZonedTime, getTimezoneOffset, toZonedTime } from 'date-fns-tz'
import { formatInstantInZone } from '../light/index'

const LOCAL_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/

export interface ResolvedInstant {
  ms: number
  // set when a wall-clock time did not exist (spring-forward gap) or happened twice (autumn overlap)
  note?: string
}

/** Local midnight of a calendar date in a zone, as epoch ms. */
export function localMidnightMs(date: string, timezone: string): number {
  return fromZonedTime(`${date}T00:00:00`, timezone).getTime()
}

/** The local calendar date (YYYY-MM-DD) of an instant in a zone. */
export function localDateOf(ms: number, timezone: string): string {
  return formatInTimeZone(ms, timezone, 'yyyy-MM-dd')
}

/**
 * An instant as ISO 8601 with the zone's offset, to the second (truncated), `Z` for a zero offset.
 * Formats from the light engine's cached offset tables rather than asking Intl for every instant:
 * lists format hundreds of these (same text as date-fns-tz, tests/unit/conflicts-instant-format.test.ts).
 */
export function formatZonedIso(ms: number, timezone: string): string {
  const text = formatInstantInZone(Math.floor(ms / 1000) * 1000, timezone)
  return text.endsWith('+00:00') ? `${text.slice(0, -6)}Z` : text
}

/**
 * Reads a shift time: an ISO instant with an offset is taken as is; a wall-clock time without
 * offset is read in the site's zone. In a spring-forward gap the time does not exist and the
 * instant one offset-change later is chosen; in an autumn overlap the earlier instant is chosen.
 * Either way the note says so.
 */
export function resolveLocalOrInstant(value: string, timezone: string): ResolvedInstant {
  const match = LOCAL_RE.exec(value)
  if (!match) return { ms: Date.parse(value) }
  const wall = `${match[1]}T${match[2]}:${match[3]}:${match[4] ?? '00'}`
  const ms = fromZonedTime(wall, timezone).getTime()
  if (formatInTimeZone(ms, timezone, 'yyyy-MM-dd\'T\'HH:mm:ss') !== wall) {
    // read the wall time with the offset in force before the gap: 02:30 in a 02:00→03:00 gap is 03:30
    const later = Date.parse(`${wall}Z`) - getTimezoneOffset(timezone, new Date(ms - 6 * 3_600_000))
    const shown = formatInTimeZone(later, timezone, 'yyyy-MM-dd\'T\'HH:mm')
    return { ms: later, note: `${wall.slice(0, 16)} does not exist in ${timezone} (clocks go forward); ${shown} was used` }
  }
  const hourLater = formatInTimeZone(ms + 3_600_000, timezone, 'yyyy-MM-dd\'T\'HH:mm:ss')
  const earlier = formatInTimeZone(ms - 3_600_000, timezone, 'yyyy-MM-dd\'T\'HH:mm:ss')
  if (hourLater === wall || earlier === wall) {
    const first = earlier === wall ? ms - 3_600_000 : ms
    return { ms: first, note: `${wall.slice(0, 16)} happens twice in ${timezone} (clocks go back); the first, ${formatZonedIso(first, timezone)}, was used` }
  }
  return { ms }
}

export { toZonedTime }
