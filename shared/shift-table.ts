// Filtering, sorting and CSV rows for the shift list. Pure: imports neither Vue nor Nitro.
import { describeLightState, type CrewItem, type ReviewState, type ShiftItem } from './planning'

export interface ShiftFilters {
  siteId: number | null
  crewId: number | null
  personId: number | null
  reviewState: ReviewState | null
  flagged: 'all' | 'flagged' | 'clear'
}

export type ShiftSortKey = 'start' | 'site' | 'title' | 'light' | 'minutesBelow' | 'review' | 'people'

/** The shifts that pass every filter; a crew matches a shift when any of its members is on it. */
export function filterShifts(shifts: ShiftItem[], f: ShiftFilters, crews: CrewItem[]): ShiftItem[] {
  const crew = f.crewId ? crews.find(c => c.id === f.crewId) : undefined
  const crewIds = new Set(crew?.members.map(m => m.id) ?? [])
  return shifts.filter(s => !s.cancelled
    && (!f.siteId || s.siteId === f.siteId)
    && (!f.personId || s.assigneeIds.includes(f.personId))
    && (!f.crewId || s.assigneeIds.some(id => crewIds.has(id)))
    && (!f.reviewState || s.reviewState === f.reviewState)
    && (f.flagged === 'all' || (f.flagged === 'flagged') === s.lightCheck.flagged))
}

const SORT_VALUE: Record<ShiftSortKey, (s: ShiftItem) => string | number> = {
  start: s => Date.parse(s.start),
  site: s => s.siteName.toLocaleLowerCase('en'),
  title: s => s.title.toLocaleLowerCase('en'),
  light: s => s.light,
  minutesBelow: s => s.lightCheck.minutesBelow,
  review: s => s.reviewState,
  people: s => s.assignees.length
}

/** A sorted copy; ties keep start order so the list stays predictable. */
export function sortShifts(shifts: ShiftItem[], key: ShiftSortKey, direction: 'asc' | 'desc'): ShiftItem[] {
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

/** One CSV row per shown shift, with ISO 8601 times in the site's offset (LOOK.md: ISO in exports). */
export function toShiftCsvRows(shifts: ShiftItem[]) {
  return shifts.map(s => ({
    start: s.start,
    end: s.end,
    timezone: s.timezone,
    site: s.siteName,
    task: s.title,
    light_needed: s.light,
    light_state: describeLightState(s).label,
    minutes_below: s.lightCheck.minutesBelow,
    review_state: s.reviewState,
    people: s.assignees.map(a => a.name).join('; '),
    conflicts: (s.conflicts ?? []).map(c => c.message).join('; '),
    conflict_reason: s.conflictOverride ?? ''
  }))
}
