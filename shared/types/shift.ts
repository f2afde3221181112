// The shift as every route replies with it (GET/POST/PATCH /api/shifts…), used by server and client
// alike: one definition. Pure types: no Vue or Nitro.
import type { LightRequirement } from '../light'
import type { ReviewReason, ReviewReasonDetail } from '../review'

export type ReviewState = 'not-needed' | 'pending' | 'approved' | 'rejected' | 'changes-requested'
export type ReviewDecision = Exclude<ReviewState, 'not-needed' | 'pending'>
export type ShiftConflictKind = 'overlap' | 'rest' | 'long' | 'unavailable' | 'weekly'

/** A work-rule warning: overlap, too little rest, too long, or an assignee away. */
export interface ShiftConflict {
  kind: ShiftConflictKind
  // null for a warning about the shift itself ('long')
  personId: number | null
  personName: string | null
  otherShiftId: number | null
  message: string
}

/** The latest safety decision on a shift. */
export interface ShiftReview {
  decision: ReviewDecision
  mitigations: string[]
  note: string
  reviewerName: string
  at: string
  // false when the shift changed after this decision
  current: boolean
}

/** One shift as the API returns it. */
export interface ShiftReply {
  id: number
  siteId: number
  siteName: string
  timezone: string
  title: string
  start: string
  end: string
  light: LightRequirement
  notes: string
  assigneeIds: number[]
  assignees: { id: number, name: string }[]
  // minutes of travel each way; the light check covers the outing, checkedFrom to checkedTo (the
  // server always sets all three; optional so that client fixtures of the first round still type)
  travelMinutes?: number
  lightCheck: { requirement: LightRequirement, minutesBelow: number, flagged: boolean, checkedFrom?: string, checkedTo?: string }
  reviewState: ReviewState
  // why the shift needs a safety decision (empty when none), and the figure behind each reason
  reviewReasons: ReviewReason[]
  reviewReasonDetails: ReviewReasonDetail[]
  // the latest safety decision, if any (it may predate a change that reopened the shift)
  review: ShiftReview | null
  conflictOverride: string | null
  // work-rule warnings (overlap, rest, long, unavailable) against the people's other shifts
  conflicts: ShiftConflict[]
  version: number
  cancelled: boolean
  // the operator's most severe weather-hold level reached in the forecast hours of the outing
  weatherHold?: ShiftWeatherHold | null
  // the rotation that made this shift, or null for a shift made on its own
  rotationId: number | null
  // set on create/patch replies when a wall-clock time fell in a clock-change gap or overlap
  timeNotes?: string[]
}

/** A weather hold on a shift (docs/api.md: level, at, cause), with the level's advice and the figures. */
export interface ShiftWeatherHold {
  level: string
  at: string
  cause: 'windKmh' | 'windChillC' | 'visibilityM'
  advice: string
  /** The hour's figure that reached the level (km/h, °C or m) and the level's own figure. */
  value: number
  limit: number
}

/** One of the operator's weather-hold levels (GET/PATCH /api/settings/holds); a figure left out is not part of it. */
export interface HoldLevel {
  name: string
  /** Reached when the wind (10 m, km/h) is at or above it. */
  windKmh?: number | null
  /** Reached when the wind chill (°C) is at or below it. */
  windChillC?: number | null
  /** Reached when the visibility (m) is at or below it. */
  visibilityM?: number | null
  advice: string
}
