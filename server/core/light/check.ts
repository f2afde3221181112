// A shift's light check (DESIGN.md, "The light model"): the minutes of the shift spent in bands that
// do not meet the light its task needs. Pure TypeScript: no framework imports.
import {
  BANDS_MEETING_REQUIREMENT,
  FLAG_MINUTES_BELOW,
  LIGHT_REQUIREMENT_KINDS,
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
}

/**
 * Checks a shift against its light requirement: `daylight` needs `day`, `civil` needs `day` or `civil`,
 * `any` (artificially lit work area) is never below requirement, though its bands are still returned.
 * minutesBelow is rounded to whole minutes; the shift is flagged from 1 minute.
 */
export function checkShiftLight(input: ShiftLightInput): ShiftLightCheck {
  const { requirement } = input
  if (!LIGHT_REQUIREMENT_KINDS.includes(requirement)) {
    throw new RangeError(`requirement must be one of ${LIGHT_REQUIREMENT_KINDS.join(', ')}, got "${requirement}"`)
  }
  const bands = computeLightPeriodsInRange(input.latitude, input.longitude, input.startMs, input.endMs)
  const meets = BANDS_MEETING_REQUIREMENT[requirement]
  let belowMs = 0
  for (const band of bands) {
    if (!meets.includes(band.kind)) belowMs += band.endMs - band.startMs
  }
  const minutesBelow = Math.round(belowMs / 60_000)
  return { requirement, minutesBelow, flagged: minutesBelow >= FLAG_MINUTES_BELOW, bands }
}
