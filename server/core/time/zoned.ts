// Shift times in a site's zone: reading a wall-clock time or an instant, and writing instants as the
// API speaks them. Built on the one offset table (zone-table.ts) and its rule for clock changes.
// Pure: no framework imports.
import { formatInstantInZone, localDateOf, localMidnightMs, resolveWallClock } from './zone-table'

export { localDateOf, localMidnightMs }

const LOCAL_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/

export interface ResolvedInstant {
  ms: number
  // set when a wall-clock time did not exist (spring-forward gap) or happened twice (an overlap)
  note?: string
}

/**
 * An instant as ISO 8601 with the zone's offset, to the second (truncated), `Z` for a zero offset:
 * the form the API's shift replies use.
 */
export function formatZonedIso(ms: number, timezone: string): string {
  const text = formatInstantInZone(Math.floor(ms / 1000) * 1000, timezone)
  return text.endsWith('+00:00') ? `${text.slice(0, -6)}Z` : text
}

function describeMinutes(ms: number): string {
  const minutes = Math.round(Math.abs(ms) / 60_000)
  return minutes % 60 === 0 ? `${minutes / 60} h` : minutes > 60 ? `${Math.floor(minutes / 60)} h ${minutes % 60} min` : `${minutes} min`
}

/**
 * Reads a shift time: an ISO instant with an offset is taken as is; a wall-clock time without
 * offset is read in the site's zone by the rule of zone-table.ts — in a spring-forward gap it moves
 * forward by the gap, in an overlap (30 min, 1 h or 2 h) the earlier instant is taken — and the
 * note says which instant was used.
 */
export function resolveLocalOrInstant(value: string, timezone: string): ResolvedInstant {
  const match = LOCAL_RE.exec(value)
  if (!match) return { ms: Date.parse(value) }
  const wall = `${match[1]}T${match[2]}:${match[3]}:${match[4] ?? '00'}`
  let reading
  try {
    reading = resolveWallClock(wall, timezone)
  } catch {
    return { ms: Number.NaN }
  }
  const shown = wall.slice(0, 16)
  if (reading.kind === 'gap') {
    const used = formatInstantInZone(reading.ms, timezone).slice(0, 16)
    return { ms: reading.ms, note: `${shown} does not exist in ${timezone} (clocks go forward ${describeMinutes(reading.gapMs)}); ${used} was used` }
  }
  if (reading.kind === 'overlap') {
    return { ms: reading.ms, note: `${shown} happens twice in ${timezone} (clocks go back ${describeMinutes(reading.overlapMs)}); the first, ${formatZonedIso(reading.ms, timezone)}, was used` }
  }
  return { ms: reading.ms }
}
