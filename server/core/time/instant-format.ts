// Wall-clock times read fast, for imports of thousands of rows. No framework imports.
import { formatZonedIso } from './zoned'

const TWIN_DISTANCES_MS = [1_800_000, 3_600_000, 7_200_000]

function readOffsetMs(iso: string): number {
  if (iso.endsWith('Z')) return 0
  const sign = iso[iso.length - 6] === '-' ? -1 : 1
  return sign * (Number(iso.slice(-5, -3)) * 60 + Number(iso.slice(-2))) * 60_000
}

/**
 * The instant of a wall-clock time `YYYY-MM-DDTHH:mm:ss` in a zone when that time happens exactly
 * once; null in a spring-forward gap or an autumn overlap, where the caller should use
 * resolveLocalOrInstant (zoned.ts) for its rule and note. Same answer as date-fns-tz's fromZonedTime
 * for every other time, at a fraction of its cost (imports read thousands of them).
 */
export function resolveWallTimeOnce(wall: string, timezone: string): number | null {
  const wallMs = Date.parse(`${wall}Z`)
  if (Number.isNaN(wallMs)) return null
  const guess = wallMs - readOffsetMs(formatZonedIso(wallMs, timezone))
  const ms = wallMs - readOffsetMs(formatZonedIso(guess, timezone))
  const at = (t: number) => formatZonedIso(t, timezone).slice(0, 19)
  if (at(ms) !== wall) return null
  // a time that happens twice has its twin one offset change away: 30 min (Lord Howe), 1 h, 2 h (Troll)
  const twinned = TWIN_DISTANCES_MS.some(d => at(ms - d) === wall || at(ms + d) === wall)
  return twinned ? null : ms
}
