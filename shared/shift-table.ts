// Filtering, sorting and CSV rows for the shift list. Pure: imports neither Vue nor Nitro.
import { describeLightState, describeShiftReasons, type CrewItem, type PersonItem, type ReviewState, type ShiftReply } from './planning'
import { REVIEW_STATE_WORDS, describeMitigation } from './review'
import { fromWallClock, toWallClock } from './format'

export interface ShiftFilters {
  siteId: number | null
  crewId: number | null
  personId: number | null
  reviewState: ReviewState | null
  flagged: 'all' | 'flagged' | 'clear'
}

export type ShiftSortKey = 'start' | 'site' | 'title' | 'light' | 'minutesBelow' | 'review' | 'people'

/** The shifts that pass every filter; a crew matches a shift when any of its members is on it. */
export function filterShifts(shifts: ShiftReply[], f: ShiftFilters, crews: CrewItem[]): ShiftReply[] {
  const crew = f.crewId ? crews.find(c => c.id === f.crewId) : undefined
  const crewIds = new Set(crew?.members.map(m => m.id) ?? [])
  return shifts.filter(s => !s.cancelled
    && (!f.siteId || s.siteId === f.siteId)
    && (!f.personId || s.assigneeIds.includes(f.personId))
    && (!f.crewId || s.assigneeIds.some(id => crewIds.has(id)))
    && (!f.reviewState || s.reviewState === f.reviewState)
    && (f.flagged === 'all' || (f.flagged === 'flagged') === s.lightCheck.flagged))
}

const SORT_VALUE: Record<ShiftSortKey, (s: ShiftReply) => string | number> = {
  start: s => Date.parse(s.start),
  site: s => s.siteName.toLocaleLowerCase('en'),
  title: s => s.title.toLocaleLowerCase('en'),
  light: s => s.light,
  minutesBelow: s => s.lightCheck.minutesBelow,
  review: s => s.reviewState,
  people: s => s.assignees.length
}

/** A sorted copy; ties keep start order so the list stays predictable. */
export function sortShifts(shifts: ShiftReply[], key: ShiftSortKey, direction: 'asc' | 'desc'): ShiftReply[] {
  const value = SORT_VALUE[key]
  const sign = direction === 'asc' ? 1 : -1
  return [...shifts].sort((a, b) => {
    const x = value(a)
    const y = value(b)
    if (x < y) return -sign
    if (x > y) return sign
    return Date.parse(a.start) - Date.parse(b.start)
  })
}

/**
 * The export's columns: first the ones the import reads (id, site, title, start, end, light, assignees,
 * notes), so an exported file can be edited and imported back as it is; then read-only columns the
 * import ignores.
 */
export const SHIFT_CSV_COLUMNS = [
  'id', 'site', 'title', 'start', 'end', 'light', 'assignees', 'notes',
  'timezone', 'light_state', 'minutes_below', 'review_state', 'review_reasons', 'review_note', 'mitigations', 'people', 'conflicts', 'conflict_reason'
] as const

/**
 * A time as the import reads it: `YYYY-MM-DD HH:mm` on the site's clock; an instant that wall clock
 * does not name back (the second pass of an autumn hour) keeps its offset, ISO 8601.
 */
export function formatCsvTime(iso: string, timezone: string): string {
  const wall = toWallClock(iso, timezone).slice(0, 16)
  return fromWallClock(wall, timezone) === Date.parse(iso) ? wall.replace('T', ' ') : iso
}

/** One CSV row per shown shift; people as e-mail addresses (the import's key), times on the site's clock. */
export function toShiftCsvRows(shifts: ShiftReply[], people: Pick<PersonItem, 'id' | 'email'>[] = []) {
  const emailOf = new Map(people.map(p => [p.id, p.email]))
  return shifts.map(s => ({
    id: s.id,
    site: s.siteName,
    title: s.title,
    start: formatCsvTime(s.start, s.timezone),
    end: formatCsvTime(s.end, s.timezone),
    light: s.light,
    assignees: s.assigneeIds.map(id => emailOf.get(id) ?? '').filter(Boolean).join(';'),
    notes: s.notes,
    timezone: s.timezone,
    light_state: describeLightState(s).label,
    minutes_below: s.lightCheck.minutesBelow,
    review_state: REVIEW_STATE_WORDS[s.reviewState],
    review_reasons: describeShiftReasons(s).join('; '),
    review_note: s.review?.current ? s.review.note : '',
    mitigations: s.review?.current ? s.review.mitigations.map(describeMitigation).join('; ') : '',
    people: s.assignees.map(a => a.name).join('; '),
    conflicts: (s.conflicts ?? []).map(c => c.message).join('; '),
    conflict_reason: s.conflictOverride ?? ''
  }))
}
