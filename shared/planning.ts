// Client-side shapes of the planning API (sites, people, crews, shifts) and the words for a shift's
// light state. Pure: imports neither Vue nor Nitro.
import type { BandKind, LightDay, LightRequirement } from './light'
import { formatDuration } from './format'

export type ReviewState = 'not-needed' | 'pending' | 'approved' | 'rejected' | 'changes-requested'
export type Role = 'coordinator' | 'safety' | 'crew'
export type ConflictKind = 'overlap' | 'rest' | 'long' | 'unavailable'

export interface SiteItem {
  id: number
  name: string
  latitude: number
  longitude: number
  elevation: number | null
  timezone: string
  defaultLight: LightRequirement
  reminderHour?: number
  notes: string
  archivedAt: string | number | null
}

export interface PersonItem { id: number, name: string, email: string, role: Role, active: boolean }
export interface CrewItem { id: number, name: string, members: { id: number, name: string, role: Role }[] }

export interface ShiftConflict {
  kind: ConflictKind
  personId: number
  personName: string
  otherShiftId: number | null
  message: string
}

export interface ShiftItem {
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
  lightCheck: { requirement: LightRequirement, minutesBelow: number, flagged: boolean }
  reviewState: ReviewState
  review: { decision: string, mitigations: string[], note: string, reviewerName: string, at: string, current: boolean } | null
  conflictOverride: string | null
  conflicts?: ShiftConflict[]
  version: number
  cancelled: boolean
  timeNotes?: string[]
}

/** The body of POST /api/shifts and /api/shifts/check. */
export interface ShiftDraft {
  siteId: number | null
  title: string
  start: string
  end: string
  light: LightRequirement
  assigneeIds: number[]
  notes: string
  overrideReason: string
}

export interface ShiftCheckReply {
  lightCheck: { requirement: LightRequirement, minutesBelow: number, flagged: boolean }
  bands: { kind: BandKind, start: string, end: string }[]
  conflicts: ShiftConflict[]
  timeNotes: string[]
}

export interface SiteLightReply { siteId: number, timezone: string, days: LightDay[] }

export type LightStateKey = 'clear' | 'flagged' | 'approved' | 'rejected' | 'changes-requested'

export interface LightState { key: LightStateKey, label: string, detail: string }

/** The words for a requirement: `daylight`, `civil light`, `any light`. */
export const REQUIREMENT_WORDS: Record<LightRequirement, string> = {
  daylight: 'daylight',
  civil: 'civil light',
  any: 'any light (lit work area)'
}

export const BAND_WORDS: Record<BandKind, string> = {
  day: 'Daylight',
  civil: 'Civil twilight',
  nautical: 'Nautical twilight',
  astronomical: 'Astronomical twilight',
  night: 'Night'
}

export const REVIEW_WORDS: Record<ReviewState, string> = {
  'not-needed': 'No review needed',
  'pending': 'Review pending',
  'approved': 'Approved',
  'rejected': 'Rejected',
  'changes-requested': 'Changes requested'
}

export const CONFLICT_WORDS: Record<ConflictKind, string> = {
  overlap: 'Overlapping shifts',
  rest: 'Short rest',
  long: 'Long shift',
  unavailable: 'Unavailable'
}

/** The light state of a shift in words: clear, flagged (N min below), or the safety decision. */
export function describeLightState(shift: Pick<ShiftItem, 'lightCheck' | 'reviewState'>): LightState {
  const { flagged, minutesBelow, requirement } = shift.lightCheck
  const below = `${formatDuration(minutesBelow)} below ${REQUIREMENT_WORDS[requirement]}`
  if (!flagged) {
    const detail = requirement === 'any' ? 'Lit work area: no daylight needed' : `Within ${REQUIREMENT_WORDS[requirement]} throughout`
    return { key: 'clear', label: 'Clear', detail }
  }
  if (shift.reviewState === 'approved') return { key: 'approved', label: 'Approved', detail: `${below}; approved by safety review` }
  if (shift.reviewState === 'rejected') return { key: 'rejected', label: 'Rejected', detail: `${below}; rejected by safety review` }
  if (shift.reviewState === 'changes-requested') return { key: 'changes-requested', label: 'Changes requested', detail: `${below}; safety review asks for changes` }
  return { key: 'flagged', label: `Flagged: ${below}`, detail: 'Waiting for safety review' }
}
