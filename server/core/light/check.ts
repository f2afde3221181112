// A shift's light check (docs/light-model.md): the minutes of the shift spent in bands that
// do not meet the light its task needs. Pure TypeScript: no framework imports.
import {
  BANDS_MEETING_REQUIREMENT,
  FLAG_MINUTES_BELOW,
  LIGHT_REQUIREMENT_KINDS,
  type LightPeriodMs,
  type LightRequirement,
  type ShiftLightCheck
} from '../../../shared/light'
import { computeLightPeriodsInRange } from './index'

export type { LightRequirement } from '../../../shared/light'

export interface ShiftLightInput {
  latitude: number
  longitude: number
  /** Shift start and end as epoch milliseconds (UTC instants). */
  startMs: number
  endMs: number
  requirement: LightRequirement
  /** Minutes of travel each way (0 when absent): the check covers the whole outing. */
  travelMinutes?: number
}

/** Longest travel each way a shift or site may carry (0–720 minutes), defined with the request limits. */
export { MAX_TRAVEL_MINUTES } from '../../../shared/schemas/limits'

/** The outing of a shift: from leaving (start − travel) to being back (end + travel), in ms. */
export function computeOutingWindow(startMs: number, endMs: number, travelMinutes = 0): { fromMs: number, toMs: number } {
  const travelMs = Math.max(0, travelMinutes) * 60_000
  return { fromMs: startMs - travelMs, toMs: endMs + travelMs }
}

/**
 * Checks a shift against its light requirement: `daylight` needs `day`, `civil` needs `day` or `civil`,
 * `any` (artificially lit work area) is never below requirement, though its bands are still returned.
 * minutesBelow is rounded to whole minutes; the shift is flagged from 1 minute. The trip out and back
 * is outdoor work in the same light as the task (a snow machine or boat in the dark is the hazard, not
 * only the work on site), so the requirement applies to the whole outing, start − travel to end + travel.
 */
export function checkShiftLight(input: ShiftLightInput): ShiftLightCheck & { checkedFromMs: number, checkedToMs: number } {
  const { requirement } = input
  if (!LIGHT_REQUIREMENT_KINDS.includes(requirement)) {
    throw new RangeError(`requirement must be one of ${LIGHT_REQUIREMENT_KINDS.join(', ')}, got "${requirement}"`)
  }
  const { fromMs, toMs } = computeOutingWindow(input.startMs, input.endMs, input.travelMinutes)
  const bands = computeLightPeriodsInRange(input.latitude, input.longitude, fromMs, toMs)
  const minutesBelow = countMinutesBelowRequirement(bands, requirement)
  return { requirement, minutesBelow, flagged: minutesBelow >= FLAG_MINUTES_BELOW, bands, checkedFromMs: fromMs, checkedToMs: toMs }
}

/** Whole minutes of the given bands in light below what the requirement needs (the total, rounded once). */
export function countMinutesBelowRequirement(bands: LightPeriodMs[], requirement: LightRequirement): number {
  const meets = BANDS_MEETING_REQUIREMENT[requirement]
  let belowMs = 0
  for (const band of bands) {
    if (!meets.includes(band.kind)) belowMs += band.endMs - band.startMs
  }
  return Math.round(belowMs / 60_000)
}
