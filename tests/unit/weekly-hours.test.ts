// The weekly limit as a work-rule option. Source: EU Working Time Directive 2003/88/EC, art. 6(b):
// "the average working time for each seven-day period, including overtime, does not exceed 48 hours"
// (the average is taken over a reference period of up to 4 months, art. 16(b)). The check here is the
// stricter rolling 7-day figure, reported per shift: exactly 48 h is within the limit, more is not.
import { afterEach, describe, expect, it } from 'vitest'
import { findShiftConflicts, type NeighbourShift } from '../../server/core/planning/conflicts'
import { people, settings, sites } from '../../server/db/schema'
import { previewRotation, RotationBodySchema } from '../../server/services/rotations'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS
const RULES = { minRestHours: 11, maxShiftHours: 12, weeklyLimitHours: 48 }
const MONDAY = Date.parse('2027-06-07T06:00:00Z')

// n earlier shifts of `hours` each, one a day from MONDAY, for person 1
function earlier(n: number, hours: number): NeighbourShift[] {
  return Array.from({ length: n }, (_, i) => ({ shiftId: i + 1, personId: 1, startMs: MONDAY + i * DAY_MS, endMs: MONDAY + i * DAY_MS + hours * HOUR_MS, title: `Day ${i + 1}`, siteName: 'Test site' }))
}

function weekly(candidateDay: number, hours: number, others: NeighbourShift[], rules: typeof RULES | Omit<typeof RULES, 'weeklyLimitHours'> = RULES) {
  const startMs = MONDAY + candidateDay * DAY_MS
  return findShiftConflicts({ shiftId: 99, startMs, endMs: startMs + hours * HOUR_MS, personIds: [1] }, { otherShifts: others, unavailable: [], personNames: { 1: 'Ada Test' } }, rules)
    .filter(c => c.kind === 'weekly')
}

afterEach(() => removeTestDatabases())

describe('the weekly hours limit (Directive 2003/88/EC art. 6, as a rolling 7-day check)', () => {
  it('allows exactly 48 hours: six 8-hour shifts', () => {
    expect(weekly(5, 8, earlier(5, 8))).toEqual([])
  })

  it('warns on the shift that takes the 7 days past 48 hours, naming the person and the hours', () => {
    const found = weekly(6, 8, earlier(6, 8))
    expect(found).toHaveLength(1)
    expect(found[0]!.personName).toBe('Ada Test')
    expect(found[0]!.message).toMatch(/56 h/)
    expect(found[0]!.message).toMatch(/48 h/)
  })

  it('counts only the part of an earlier shift inside the 7 days', () => {
    // the candidate (day 6, 06:00–14:00 UTC) looks back to day −1 at 14:00: a 10:00–16:00 shift that day
    // counts 2 h, not 6. Six 6 h days + 8 h + 2 h = 46 h: within 48 (counted whole it would be 50 h)
    const before = { shiftId: 50, personId: 1, startMs: MONDAY - DAY_MS + 4 * HOUR_MS, endMs: MONDAY - DAY_MS + 10 * HOUR_MS, title: 'Day −1', siteName: 'Test site' }
    expect(weekly(6, 8, [before, ...earlier(6, 6)])).toEqual([])
    // six 6.5 h days + 8 h + 2 h = 49 h: over
    const over = weekly(6, 8, [before, ...earlier(6, 6.5)])
    expect(over).toHaveLength(1)
    expect(over[0]!.message).toMatch(/49 h/)
  })

  it('says nothing when the option is off', () => {
    expect(weekly(6, 8, earlier(6, 8), { minRestHours: 11, maxShiftHours: 12 })).toEqual([])
  })

  it('reports it per shift in a rotation preview, from the fifth 10-hour day on', () => {
    const db = createTestDatabase('gloamline-weekly-')
    const site = db.insert(sites).values({ name: 'Weekly Test Yard', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' }).returning().get()
    const [ada] = db.insert(people).values([{ name: 'Ada Test', email: 'ada@weekly.test', role: 'crew' }]).returning().all()
    db.insert(settings).values({ key: 'work-rules', value: { weeklyLimitHours: 48 } }).run()
    const preview = previewRotation(db, RotationBodySchema.parse({
      siteId: site.id, title: 'Long days', light: 'any', from: '2027-06-07', to: '2027-06-13',
      startTime: '07:00', endTime: '17:00', onDays: 7, offDays: 0, assigneeIds: [ada!.id]
    }))
    const flagged = preview.shifts.map(s => s.conflicts.some(c => c.kind === 'weekly'))
    // 4 × 10 h = 40, the fifth makes 50 > 48
    expect(flagged).toEqual([false, false, false, false, true, true, true])
  })
})
