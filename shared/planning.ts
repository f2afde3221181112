// Client-side shapes of the planning API (sites, people, crews, shifts) and the words for a shift's
// light state. Pure: imports neither Vue nor Nitro.
import type { BandKind, LightDay, LightRequirement } from './light'
import { formatDuration } from './format'
import { ShiftBodySchema } from './schemas/shift'
import { hasControlCharacters } from './schemas/fields'
import { MAX_TITLE_LENGTH } from './schemas/limits'
import { collectFieldIssues } from './schemas/issues'
import type { Role } from './roles'
import { REVIEW_REASON_WORDS, REVIEW_STATE_WORDS, describeReviewReason, describeReviewReasonFigure } from './review'
import type { ReviewState, ShiftConflict, ShiftConflictKind as ConflictKind, ShiftReply } from './types/shift'

export type { ReviewState, ShiftConflict, ShiftReply } from './types/shift'
export type { Role }
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
  // minutes of travel each way, the default for new shifts here
  travelMinutes?: number
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
  travelMinutes?: number
  notes: string
}

// email is null for a crew member looking at a colleague; pending: has not chosen a password yet
export interface PersonItem { id: number, name: string, email: string | null, role: Role, active: boolean, pending?: boolean }
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
  // minutes of travel each way; null or absent: the site's default
  travelMinutes?: number | null
}

export interface ShiftCheckReply {
  travelMinutes?: number
  // what would send the draft to safety review, as the write will store it
  reviewReasons?: ShiftReply['reviewReasons']
  reviewReasonDetails?: ShiftReply['reviewReasonDetails']
  lightCheck: { requirement: LightRequirement, minutesBelow: number, flagged: boolean, checkedFrom?: string, checkedTo?: string }
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
  // shifts: add a shift, change the planned shift `shiftId`, or nothing (same as planned)
  action?: 'create' | 'update' | 'unchanged'
  shiftId?: number
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

/** A requirement's short name: `daylight`, `civil light`, `any light`. */
export const REQUIREMENT_NAMES: Record<LightRequirement, string> = {
  daylight: 'daylight',
  civil: 'civil light',
  any: 'any light'
}

/** What a requirement asks of the light (docs/light-model.md, "Requirements"). */
export const REQUIREMENT_MEANINGS: Record<LightRequirement, string> = {
  daylight: 'sun above the horizon',
  civil: 'daylight or civil twilight',
  any: 'lit work area'
}

/** `civil light (daylight or civil twilight)`: a requirement with what it means. */
export function describeRequirement(requirement: LightRequirement): string {
  return `${REQUIREMENT_NAMES[requirement]} (${REQUIREMENT_MEANINGS[requirement]})`
}

/** The words for a requirement in a sentence: `daylight`, `civil light`, `any light (lit work area)`. */
export const REQUIREMENT_WORDS: Record<LightRequirement, string> = {
  daylight: REQUIREMENT_NAMES.daylight,
  civil: REQUIREMENT_NAMES.civil,
  any: describeRequirement('any')
}

export const BAND_WORDS: Record<BandKind, string> = {
  day: 'Daylight',
  civil: 'Civil twilight',
  nautical: 'Nautical twilight',
  astronomical: 'Astronomical twilight',
  night: 'Night'
}

/** One word per review state, the same on every screen, in mail, CSV and the feed (shared/review.ts). */
export const REVIEW_WORDS: Record<ReviewState, string> = REVIEW_STATE_WORDS

export const CONFLICT_WORDS: Record<ConflictKind, string> = {
  overlap: 'Overlapping shifts',
  rest: 'Short rest',
  long: 'Long shift',
  unavailable: 'Unavailable',
  weekly: 'Weekly hours'
}

type LightStateShift = Pick<ShiftReply, 'lightCheck' | 'reviewState'> & Partial<Pick<ShiftReply, 'reviewReasonDetails' | 'timezone' | 'review'>>

/** The review reasons of a shift in words with their figures; for older replies, the light alone. */
export function describeShiftReasons(shift: LightStateShift): string[] {
  if (shift.reviewReasonDetails?.length) return shift.reviewReasonDetails.map(r => describeReviewReason(r, shift.timezone))
  if (!shift.lightCheck.flagged) return []
  return [describeReviewReason({ reason: 'light', minutesBelow: shift.lightCheck.minutesBelow, requirement: shift.lightCheck.requirement }, shift.timezone)]
}

/**
 * The state of a shift in words: clear (no review needed), waiting (with its reasons), or the safety
 * decision, each named by its one state word (REVIEW_STATE_WORDS).
 */
export function describeLightState(shift: LightStateShift): LightState {
  const { flagged, minutesBelow, requirement } = shift.lightCheck
  const reasons = describeShiftReasons(shift)
  const why = reasons.length ? reasons.join('; ') : (flagged ? `${formatDuration(minutesBelow)} below ${REQUIREMENT_WORDS[requirement]}` : '')
  const details = shift.reviewReasonDetails?.length ? shift.reviewReasonDetails : (flagged ? [{ reason: 'light' as const, minutesBelow, requirement }] : [])
  const figures = details.map(r => describeReviewReasonFigure(r, shift.timezone)).join('; ')
  const reasonWords = details.map(r => REVIEW_REASON_WORDS[r.reason].toLowerCase())
  const note = shift.review?.current && shift.review.note ? ` Note: ${shift.review.note}` : ''
  if (shift.reviewState === 'not-needed') {
    const detail = requirement === 'any' ? 'Lit work area: no daylight needed' : `Within ${REQUIREMENT_WORDS[requirement]} throughout`
    return { key: 'clear', label: 'Clear', short: 'Clear', detail: `${detail}. ${REVIEW_STATE_WORDS['not-needed']}.` }
  }
  const word = REVIEW_STATE_WORDS[shift.reviewState]
  if (shift.reviewState === 'approved') return { key: 'approved', label: word, short: word, detail: `${why}.${note}` }
  if (shift.reviewState === 'rejected') return { key: 'rejected', label: word, short: word, detail: `${why}.${note}` }
  if (shift.reviewState === 'changes-requested') return { key: 'changes-requested', label: word, short: word, detail: `${why}.${note}` }
  const short = reasonWords.length ? `${word}: ${reasonWords.join(', ')}` : word
  return { key: 'flagged', label: figures ? `${word}: ${figures}` : word, short, detail: why ? `Why: ${why}.` : '' }
}

const WALL_RE = /^\d{4}-\d{2}-\d{2}T([01]\d|2[0-3]):[0-5]\d$/
/** Longest shift the server accepts (docs/api.md, "Shifts": longer than 7 days is refused). */
export const MAX_SHIFT_MINUTES = 7 * 24 * 60

/**
 * Checks a shift draft before it is sent: { field: message } for what is wrong, empty when it may go.
 * Times are wall clocks in one zone, so comparing them as UTC is exact except across a DST change,
 * where the server's own check decides.
 */
export function validateShiftDraft(draft: ShiftDraft, conflicts: ShiftConflict[] = []): Record<string, string> {
  // the server's own schema first (shared/schemas/shift.ts), then the friendlier words below
  const { siteId: _site, title: _title, start: _start, end: _end, ...errors } = collectFieldIssues(ShiftBodySchema, {
    ...draft, siteId: draft.siteId ?? undefined, travelMinutes: draft.travelMinutes ?? undefined
  })
  if (!draft.siteId) errors.siteId = 'Choose the site.'
  if (!draft.title.trim()) errors.title = 'Say what the task is.'
  else if (draft.title.trim().length > MAX_TITLE_LENGTH) errors.title = `Keep the task under ${MAX_TITLE_LENGTH} characters.`
  else if (hasControlCharacters(draft.title)) errors.title = 'Keep the task on one line.'
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
