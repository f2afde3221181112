// Client-side shapes of the planning API (sites, people, crews, shifts) and the words for a shift's
// light state. Pure: imports neither Vue nor Nitro.
import type { BandKind, LightDay, LightRequirement } from './light'
import { formatDuration } from './format'
import type { ReviewState, ShiftConflict, ShiftConflictKind as ConflictKind, ShiftReply as ShiftItem } from './types/shift'

export type { ReviewState, ShiftConflict, ShiftReply as ShiftItem } from './types/shift'
export type Role = 'coordinator' | 'safety' | 'crew'
export type { ShiftConflictKind as ConflictKind } from './types/shift'

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

/** The body of POST /api/sites and PATCH /api/sites/:id. */
export interface SiteBody {
  name: string
  latitude: number
  longitude: number
  elevation: number | null
  timezone: string
  defaultLight: LightRequirement
  reminderHour: number
  notes: string
}

export interface PersonItem { id: number, name: string, email: string, role: Role, active: boolean }
export interface CrewItem { id: number, name: string, members: { id: number, name: string, role: Role }[] }

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

/** One row of an import preview (POST /api/import/shifts|people/preview). */
export interface ImportPreviewRow {
  row: number
  ok: boolean
  errors: string[]
  notes?: string[]
  timeNotes?: string[]
  shift?: { siteId: number, siteName: string, title: string, start: string, end: string, light: LightRequirement, assigneeIds: number[] }
  lightCheck?: { requirement: LightRequirement, minutesBelow: number, flagged: boolean }
  conflicts?: ShiftConflict[]
  person?: { name: string, email: string, role: string, crews: string[], existingId: number | null }
}

export interface ImportPreview { valid: boolean, rows: ImportPreviewRow[], errors: string[], crewsToCreate?: string[] }

export type LightStateKey = 'clear' | 'flagged' | 'approved' | 'rejected' | 'changes-requested'

export interface LightState { key: LightStateKey, label: string, short: string, detail: string }

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
    return { key: 'clear', label: 'Clear', short: 'Clear', detail }
  }
  const short = formatDuration(minutesBelow)
  if (shift.reviewState === 'approved') return { key: 'approved', label: 'Approved', short: 'Approved', detail: `${below}; approved by safety review` }
  if (shift.reviewState === 'rejected') return { key: 'rejected', label: 'Rejected', short: 'Rejected', detail: `${below}; rejected by safety review` }
  if (shift.reviewState === 'changes-requested') return { key: 'changes-requested', label: 'Changes requested', short: 'Changes asked', detail: `${below}; safety review asks for changes` }
  return { key: 'flagged', label: `Flagged: ${below}`, short: `Flagged: ${short} below`, detail: 'Waiting for safety review' }
}

const WALL_RE = /^\d{4}-\d{2}-\d{2}T([01]\d|2[0-3]):[0-5]\d$/
/** Longest shift the server accepts (DESIGN.md bad input: longer than 7 days is refused). */
export const MAX_SHIFT_MINUTES = 7 * 24 * 60

/**
 * Checks a shift draft before it is sent: { field: message } for what is wrong, empty when it may go.
 * Times are wall clocks in one zone, so comparing them as UTC is exact except across a DST change,
 * where the server's own check decides.
 */
export function validateShiftDraft(draft: ShiftDraft, conflicts: ShiftConflict[] = []): Record<string, string> {
  const errors: Record<string, string> = {}
  if (!draft.siteId) errors.siteId = 'Choose the site.'
  if (!draft.title.trim()) errors.title = 'Say what the task is.'
  else if (draft.title.trim().length > 200) errors.title = 'Keep the task under 200 characters.'
  if (!WALL_RE.test(draft.start)) errors.start = 'Give a start date and a 24-hour time (HH:mm).'
  if (!WALL_RE.test(draft.end)) errors.end = 'Give an end date and a 24-hour time (HH:mm).'
  if (!errors.start && !errors.end) {
    const minutes = (Date.parse(`${draft.end}Z`) - Date.parse(`${draft.start}Z`)) / 60_000
    if (minutes <= 0) errors.end = 'The end must be after the start.'
    else if (minutes > MAX_SHIFT_MINUTES) errors.end = 'A shift may last at most 7 days.'
  }
  if (conflicts.length && !draft.overrideReason.trim()) {
    errors.overrideReason = 'This shift has conflict warnings: give the reason for keeping it, or change it.'
  }
  return errors
}
