// Why a shift goes to safety review (docs/api.md, "Review"): its light, the cold
// it meets, one person alone in the dark, or its length. Pure TypeScript: no framework, database or
// network imports; the shift services load the inputs and store the result on the shift.
import type { LightPeriodMs, LightRequirement } from '../../../shared/light'
import type { ReviewReasonDetail } from '../../../shared/review'
import { checkShiftLight, countMinutesBelowRequirement } from '../light/check'
import type { ColdWindowFigures } from './queue'

const MINUTE_MS = 60_000

/** The checked window: the shift itself, or the whole outing with travel out and back. */
export interface ReviewWindow {
  fromMs: number
  toMs: number
}

export interface ReviewReasonInput {
  latitude: number
  longitude: number
  /** The window the light, cold and lone checks cover (the outing when travel is known). */
  window: ReviewWindow
  /** The shift's own start and end: its length is what the work rules limit. */
  shiftStartMs: number
  shiftEndMs: number
  /** The stored light check of the shift (over the same window). */
  lightCheck: { flagged: boolean, minutesBelow: number, requirement: LightRequirement }
  assigneeCount: number
  /** The light bands of the window when the caller has them already; computed here otherwise. */
  bands?: LightPeriodMs[]
  /** Cold figures over the window: from the forecast, else the newest site readings; null when unknown. */
  cold: (Pick<ColdWindowFigures, 'worstWindChill' | 'warmup'> & { basis?: 'forecast' | 'observations' }) | null
  rules: { maxShiftHours: number, reviewWindChillC: number }
}

/**
 * Minutes of a window with the sun's centre below −6° (darker than civil twilight). Reuses the light
 * engine's civil check: `civil` counts day and civil twilight as enough light, so what is left below
 * it is exactly nautical twilight or darker.
 */
export function countMinutesBelowCivil(latitude: number, longitude: number, window: ReviewWindow): number {
  if (!(window.toMs > window.fromMs)) return 0
  return checkShiftLight({ latitude, longitude, startMs: window.fromMs, endMs: window.toMs, requirement: 'civil' }).minutesBelow
}

/**
 * Whether the cold figures reach the review limit. The limit is compared with the whole-degree wind
 * chill, as the published NWS/ECCC charts print it, so a chart cell equal to the limit counts.
 */
function assessCold(cold: ReviewReasonInput['cold'], limitC: number): ReviewReasonDetail | null {
  if (!cold) return null
  const chill = cold.worstWindChill
  const atLimit = chill !== null && chill.roundedC <= limitC
  const stopWork = cold.warmup.stopWork
  if (!atLimit && !stopWork) return null
  return {
    reason: 'cold',
    windChillC: chill ? chill.roundedC : null,
    at: chill ? chill.at : cold.warmup.at,
    limitC,
    stopWork,
    temperatureC: cold.warmup.temperatureC,
    windKmh: Math.round(cold.warmup.windKmh),
    basis: cold.basis ?? 'forecast'
  }
}

/** Every reason the shift needs a safety decision, in a fixed order (light, cold, lone, long); empty when none. */
export function computeReviewReasons(input: ReviewReasonInput): ReviewReasonDetail[] {
  const out: ReviewReasonDetail[] = []
  if (input.lightCheck.flagged) {
    out.push({ reason: 'light', minutesBelow: input.lightCheck.minutesBelow, requirement: input.lightCheck.requirement })
  }
  const cold = assessCold(input.cold, input.rules.reviewWindChillC)
  if (cold) out.push(cold)
  // One person alone: any minute darker than civil twilight, whatever light the task itself needs
  // (a lit work area does not light the way to it, nor make a fall or a breakdown less lonely).
  if (input.assigneeCount === 1) {
    const minutesDark = input.bands
      ? countMinutesBelowRequirement(input.bands, 'civil')
      : countMinutesBelowCivil(input.latitude, input.longitude, input.window)
    if (minutesDark >= 1) out.push({ reason: 'lone', minutesDark })
  }
  const minutes = Math.round((input.shiftEndMs - input.shiftStartMs) / MINUTE_MS)
  const maxMinutes = Math.round(input.rules.maxShiftHours * 60)
  if (minutes > maxMinutes) out.push({ reason: 'long', minutes, maxMinutes })
  return out
}
