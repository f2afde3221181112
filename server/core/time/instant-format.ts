// Wall-clock times read fast, for imports of thousands of rows. No framework imports.
import { resolveWallClock } from './zone-table'

/**
 * The instant of a wall-clock time `YYYY-MM-DDTHH:mm:ss` in a zone when that time happens exactly
 * once; null in a spring-forward gap or an overlap, where the caller should use
 * resolveLocalOrInstant (zoned.ts) for its note, and null for text that is not such a time.
 */
export function resolveWallTimeOnce(wall: string, timezone: string): number | null {
  try {
    const reading = resolveWallClock(wall, timezone)
    return reading.kind === 'once' ? reading.ms : null
  } catch {
    return null
  }
}
