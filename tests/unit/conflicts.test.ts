import { describe, expect, it } from 'vitest'
import { findShiftConflicts, isRestTooShort, type ConflictContext, type NeighbourShift } from '../../server/core/planning/conflicts'

// Outside references for the figures checked here:
// - EU Working Time Directive 2003/88/EC, art. 3: "a minimum daily rest period of 11 consecutive
//   hours per 24-hour period" (the default minRestHours).
// - A 12-hour maximum shift is common practice in field rosters (not a statute): the default maxShiftHours.
const RULES = { minRestHours: 11, maxShiftHours: 12 }
const H = 3_600_000
const MIN = 60_000
// a fixed Monday 00:00 UTC, so the figures read as clock times
const DAY0 = Date.UTC(2027, 0, 11)
const at = (hours: number) => DAY0 + hours * H

const LIV = 7
const KALLE = 8

function neighbour(shiftId: number, personId: number, startH: number, endH: number): NeighbourShift {
  return { shiftId, personId, startMs: at(startH), endMs: at(endH), title: `Task ${shiftId}`, siteName: 'Test Camp' }
}

function context(otherShifts: NeighbourShift[] = [], unavailable: ConflictContext['unavailable'] = []): ConflictContext {
  return { otherShifts, unavailable, personNames: new Map([[LIV, 'Liv'], [KALLE, 'Kalle']]) }
}

describe('overlapping shifts', () => {
  it('warns when one person is on two shifts at once, naming the other shift', () => {
    const found = findShiftConflicts({ startMs: at(8), endMs: at(14), personIds: [LIV] }, context([neighbour(31, LIV, 13, 17)]), RULES)
    expect(found).toEqual([expect.objectContaining({ kind: 'overlap', personId: LIV, personName: 'Liv', otherShiftId: 31 })])
    expect(found[0]!.message).toContain('“Task 31” at Test Camp')
  })

  it('does not warn for back-to-back shifts (end = start is no overlap) or for another person', () => {
    const found = findShiftConflicts({ startMs: at(8), endMs: at(13), personIds: [LIV] }, context([neighbour(31, LIV, 13, 17), neighbour(32, KALLE, 9, 12)]), RULES)
    expect(found).toEqual([])
  })

  it('leaves the shift itself out of its neighbours when it is already stored', () => {
    const found = findShiftConflicts({ shiftId: 31, startMs: at(8), endMs: at(14), personIds: [LIV] }, context([neighbour(31, LIV, 8, 14)]), RULES)
    expect(found).toEqual([])
  })
})

describe('rest between shifts (EU Working Time Directive 2003/88/EC, art. 3: 11 h)', () => {
  it('warns about 7 h of rest between an evening shift and the next early shift', () => {
    // 19:00–23:00 then 06:00–10:00 the next day
    const found = findShiftConflicts({ startMs: at(30), endMs: at(34), personIds: [LIV] }, context([neighbour(40, LIV, 19, 23)]), RULES)
    expect(found.map(c => c.kind)).toEqual(['rest'])
    expect(found[0]!.message).toContain('7 h')
    expect(found[0]!.otherShiftId).toBe(40)
  })

  it('checks both directions: the other shift may come after this one', () => {
    const found = findShiftConflicts({ startMs: at(8), endMs: at(20), personIds: [LIV] }, context([neighbour(41, LIV, 30, 34)]), RULES)
    expect(found.map(c => c.kind)).toEqual(['rest'])
  })

  it('accepts exactly 11 h of rest (the boundary is allowed)', () => {
    // 08:00–20:00, then 07:00 the next day: 11 h 0 min
    const found = findShiftConflicts({ startMs: at(31), endMs: at(35), personIds: [LIV] }, context([neighbour(42, LIV, 8, 20)]), RULES)
    expect(found).toEqual([])
  })

  it('warns at 10 h 59 min of rest', () => {
    const found = findShiftConflicts({ startMs: at(31) - MIN, endMs: at(35), personIds: [LIV] }, context([neighbour(42, LIV, 8, 20)]), RULES)
    expect(found.map(c => c.kind)).toEqual(['rest'])
    expect(found[0]!.message).toContain('10 h 59 min')
  })

  it('treats a short gap inside one working day as a break, not a rest period', () => {
    // 09–13 and 13–17, or 08–14 and 15–18: the day still leaves far more than 11 h of rest in 24 h
    expect(findShiftConflicts({ startMs: at(13), endMs: at(17), personIds: [LIV] }, context([neighbour(43, LIV, 9, 13)]), RULES)).toEqual([])
    expect(findShiftConflicts({ startMs: at(15), endMs: at(18), personIds: [LIV] }, context([neighbour(44, LIV, 8, 14)]), RULES)).toEqual([])
  })

  it('warns when a split day spreads wider than 13 h, leaving under 11 h of rest in 24 h', () => {
    // 07–17 then 19–03: 20 h from first start to last end
    const found = findShiftConflicts({ startMs: at(19), endMs: at(27), personIds: [LIV] }, context([neighbour(45, LIV, 7, 17)]), RULES)
    expect(found.map(c => c.kind)).toEqual(['rest'])
    expect(found[0]!.message).toContain('20 h')
  })

  it('puts the split-day boundary at exactly 24 − 11 = 13 h of spread', () => {
    expect(isRestTooShort({ startMs: at(6), endMs: at(10) }, { startMs: at(15), endMs: at(19) }, 11)).toBe(false)
    expect(isRestTooShort({ startMs: at(6), endMs: at(10) }, { startMs: at(15), endMs: at(19) + MIN }, 11)).toBe(true)
  })

  it('follows the configured minimum', () => {
    const found = findShiftConflicts({ startMs: at(31), endMs: at(35), personIds: [LIV] }, context([neighbour(42, LIV, 8, 20)]), { ...RULES, minRestHours: 12 })
    expect(found.map(c => c.kind)).toEqual(['rest'])
  })
})

describe('long shifts (12 h maximum: common practice)', () => {
  it('accepts exactly 12 h', () => {
    expect(findShiftConflicts({ startMs: at(6), endMs: at(18), personIds: [] }, context(), RULES)).toEqual([])
  })

  it('warns once for the shift at 12 h 1 min, with no person attached', () => {
    const found = findShiftConflicts({ startMs: at(6), endMs: at(18) + MIN, personIds: [LIV, KALLE] }, context(), RULES)
    expect(found).toEqual([{ kind: 'long', personId: null, personName: null, otherShiftId: null, message: expect.stringContaining('12 h 1 min') }])
  })
})

describe('unavailability', () => {
  it('warns when an assignee has a blocked span overlapping the shift, with its reason', () => {
    const blocked = [{ personId: KALLE, startMs: at(0), endMs: at(24), reason: 'Leave' }]
    const found = findShiftConflicts({ startMs: at(8), endMs: at(12), personIds: [LIV, KALLE] }, context([], blocked), RULES)
    expect(found).toEqual([{ kind: 'unavailable', personId: KALLE, personName: 'Kalle', otherShiftId: null, message: 'Kalle is unavailable during this shift (Leave)' }])
  })

  it('does not warn when the blocked span ends as the shift starts', () => {
    const blocked = [{ personId: KALLE, startMs: at(0), endMs: at(8), reason: 'Travel day' }]
    expect(findShiftConflicts({ startMs: at(8), endMs: at(12), personIds: [KALLE] }, context([], blocked), RULES)).toEqual([])
  })
})

describe('several warnings at once', () => {
  it('lists every kind for every person, each other shift once, and accepts names as a record', () => {
    const others = [neighbour(50, LIV, 10, 12), neighbour(50, LIV, 10, 12), neighbour(51, KALLE, 30, 34)]
    const blocked = [{ personId: LIV, startMs: at(9), endMs: at(10), reason: '' }]
    const found = findShiftConflicts({ startMs: at(8), endMs: at(21), personIds: [LIV, KALLE, LIV] }, { otherShifts: others, unavailable: blocked, personNames: { [LIV]: 'Liv' } }, RULES)
    expect(found.map(c => [c.kind, c.personId])).toEqual([['long', null], ['overlap', LIV], ['unavailable', LIV], ['rest', KALLE]])
    const unnamed = found.find(c => c.personId === KALLE)!
    expect(unnamed.personName).toBeNull()
    expect(unnamed.message).toContain('Person #8')
  })
})
