import { describe, expect, it } from 'vitest'
import { buildBandEvents, buildShiftEvents, calendarRange, summariseDay, wallFromCalendarDate } from '../../shared/calendar'
import { validateShiftDraft, type ShiftDraft, type ShiftReply, type SiteItem } from '../../shared/planning'
import { filterShifts, formatCsvTime, sortShifts, toShiftCsvRows } from '../../shared/shift-table'
import { useCalendarStore } from '../../stores/calendar'

// Invented demo data (not a reference).
const SITE: SiteItem = { id: 1, name: 'Test Fjord Camp', latitude: 78.2, longitude: 15.6, elevation: null, timezone: 'Europe/Oslo', defaultLight: 'civil', notes: '', archivedAt: null }
function shiftItem(id: number, over: Partial<ShiftReply> = {}): ShiftReply {
  return {
    id, siteId: 1, siteName: 'Test Fjord Camp', timezone: 'Europe/Oslo', title: `Task ${id}`,
    start: '2027-03-02T10:00:00+01:00', end: '2027-03-02T13:00:00+01:00', light: 'civil', notes: '',
    assigneeIds: [], assignees: [], lightCheck: { requirement: 'civil', minutesBelow: 0, flagged: false },
    reviewState: 'not-needed', reviewReasons: [], reviewReasonDetails: [], review: null, conflictOverride: null, conflicts: [], version: 1, cancelled: false, rotationId: null, ...over
  }
}

describe('the calendar range', () => {
  // ISO 8601 weeks start on Monday; 3 March 2027 is a Wednesday and 1 March 2027 a Monday
  // (Zeller's congruence, as in format.test.ts).
  it('covers the Monday-to-Sunday week around a date', () => {
    expect(calendarRange('week', '2027-03-03')).toEqual({ from: '2027-03-01', to: '2027-03-08' })
    expect(calendarRange('week', '2027-03-07')).toEqual({ from: '2027-03-01', to: '2027-03-08' })
    expect(calendarRange('week', '2027-03-08')).toEqual({ from: '2027-03-08', to: '2027-03-15' })
  })

  it('covers the six-week month grid from the Monday on or before the 1st', () => {
    // 1 December 2026 is a Tuesday, so the grid starts on Monday 30 November
    expect(calendarRange('month', '2026-12-17')).toEqual({ from: '2026-11-30', to: '2027-01-11' })
  })
})

describe('what the calendar draws', () => {
  const lights = [{
    site: SITE,
    days: [{
      date: '2027-03-02', solarNoon: '', maxAltitude: 0, minAltitude: 0, daylightMinutes: 444, civilLightMinutes: 560, status: 'rises-and-sets' as const, events: [],
      periods: [{ kind: 'night' as const, start: '2027-03-02T00:00:00+01:00', end: '2027-03-02T08:14:00+01:00' }, { kind: 'day' as const, start: '2027-03-02T08:14:00+01:00', end: '2027-03-03T00:00:00+01:00' }]
    }]
  }]

  it('draws each light period as a background band in the display zone\'s wall clock', () => {
    const bands = buildBandEvents(lights, 'Europe/Oslo')
    expect(bands.map(b => [b.start, b.end, b.display])).toEqual([
      ['2027-03-02T00:00:00', '2027-03-02T08:14:00', 'background'],
      ['2027-03-02T08:14:00', '2027-03-03T00:00:00', 'background']
    ])
    expect(bands[0]!.classNames).toContain('gl-band-night')
    // the same instants on a UTC clock are one hour earlier in March (CET = UTC+1)
    expect(buildBandEvents(lights, 'UTC')[1]!.start).toBe('2027-03-02T07:14:00')
  })

  it('marks each shift with its light state and leaves cancelled ones out', () => {
    const events = buildShiftEvents([
      shiftItem(1),
      shiftItem(2, { lightCheck: { requirement: 'civil', minutesBelow: 40, flagged: true }, reviewState: 'pending' }),
      shiftItem(3, { cancelled: true })
    ], 'Europe/Oslo', true)
    expect(events.map(e => e.id)).toEqual(['1', '2'])
    expect(events[1]!.classNames).toContain('gl-shift-flagged')
    expect(events[0]!.start).toBe('2027-03-02T10:00:00')
  })

  it('sums up a day\'s light in words for the column header', () => {
    expect(summariseDay(lights, '2027-03-02')).toEqual([{ siteName: 'Test Fjord Camp', text: 'Daylight 7 h 24 min' }])
    expect(summariseDay(lights, '2027-03-09')[0]!.text).toBe('No light data')
  })

  it('turns a calendar date back into the wall clock it was fed', () => {
    expect(wallFromCalendarDate(new Date('2027-03-02T10:15:00Z'))).toBe('2027-03-02T10:15')
  })
})

describe('checking a shift draft before it is sent', () => {
  const draft: ShiftDraft = { siteId: 1, title: 'Route check', start: '2027-03-02T10:00', end: '2027-03-02T13:00', light: 'civil', assigneeIds: [], notes: '', overrideReason: '' }

  it('lets a complete draft through', () => {
    expect(validateShiftDraft(draft)).toEqual({})
  })

  it('names each wrong field', () => {
    const errors = validateShiftDraft({ ...draft, siteId: null, title: '', start: '2027-03-02T25:00', end: '' })
    expect(Object.keys(errors).sort()).toEqual(['end', 'siteId', 'start', 'title'])
  })

  it('accepts exactly 7 days and refuses a minute more', () => {
    expect(validateShiftDraft({ ...draft, end: '2027-03-09T10:00' })).toEqual({})
    expect(validateShiftDraft({ ...draft, end: '2027-03-09T10:01' }).end).toContain('7 days')
  })
})

describe('the shift list', () => {
  const crews = [{ id: 5, name: 'Test crew', members: [{ id: 7, name: 'Test Person', role: 'crew' as const }] }]
  const shifts = [
    shiftItem(1, { start: '2027-03-03T10:00:00+01:00', title: 'b task' }),
    shiftItem(2, { assigneeIds: [7], assignees: [{ id: 7, name: 'Test Person' }], title: 'A task', lightCheck: { requirement: 'civil', minutesBelow: 40, flagged: true }, reviewState: 'pending' }),
    shiftItem(3, { siteId: 2, siteName: 'Other', cancelled: true })
  ]
  const none = { siteId: null, crewId: null, personId: null, reviewState: null, flagged: 'all' as const }

  it('filters by crew, person, review state and flag, and never shows cancelled shifts', () => {
    expect(filterShifts(shifts, none, crews).map(s => s.id)).toEqual([1, 2])
    expect(filterShifts(shifts, { ...none, crewId: 5 }, crews).map(s => s.id)).toEqual([2])
    expect(filterShifts(shifts, { ...none, personId: 7 }, crews).map(s => s.id)).toEqual([2])
    expect(filterShifts(shifts, { ...none, flagged: 'clear' }, crews).map(s => s.id)).toEqual([1])
    expect(filterShifts(shifts, { ...none, reviewState: 'pending' }, crews).map(s => s.id)).toEqual([2])
  })

  it('sorts by a column either way', () => {
    expect(sortShifts(shifts.slice(0, 2), 'start', 'asc').map(s => s.id)).toEqual([2, 1])
    expect(sortShifts(shifts.slice(0, 2), 'title', 'asc').map(s => s.id)).toEqual([2, 1])
    expect(sortShifts(shifts.slice(0, 2), 'minutesBelow', 'desc').map(s => s.id)).toEqual([2, 1])
  })

  it('exports the import\'s columns and time format, with people as e-mail addresses and state words', () => {
    const rows = toShiftCsvRows([shifts[1]!], [{ id: 7, email: 'test.person@example.test' }])
    expect(rows).toEqual([expect.objectContaining({
      id: 2, site: 'Test Fjord Camp', title: 'A task', start: '2027-03-02 10:00', end: '2027-03-02 13:00', light: 'civil',
      assignees: 'test.person@example.test', timezone: 'Europe/Oslo', minutes_below: 40,
      light_state: 'Awaiting review: 40 min below civil light', review_state: 'Awaiting review', people: 'Test Person'
    })])
  })

  // Europe/Oslo leaves summer time on 31 October 2027 at 03:00 CEST (last Sunday of October, EU rule):
  // 02:30 happens twice, first at 00:30Z then at 01:30Z (tz database).
  it('keeps the offset of a time the wall clock cannot name back (the second 02:30 of the autumn change)', () => {
    expect(formatCsvTime('2027-10-31T02:30:00+02:00', 'Europe/Oslo')).toBe('2027-10-31 02:30')
    expect(formatCsvTime('2027-10-31T02:30:00+01:00', 'Europe/Oslo')).toBe('2027-10-31T02:30:00+01:00')
  })
})

describe('the calendar store', () => {
  it('steps a week or a month at a time and keeps each chosen site once', () => {
    const store = useCalendarStore()
    store.chooseSites([2, 2, 1])
    expect(store.siteIds).toEqual([2, 1])
    store.toggleSite(2)
    expect(store.siteIds).toEqual([1])
    store.step(1, '2027-03-03')
    expect(store.date).toBe('2027-03-10')
    store.view = 'month'
    store.step(-1, '2027-03-03')
    expect(store.date).toBe('2027-02-01')
  })
})
