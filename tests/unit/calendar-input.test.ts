// Dates and times the product takes in (shared/schemas/calendar.ts): real calendar dates checked
// against date-fns 4 isExists (an outside implementation of the proleptic Gregorian calendar), real
// 24-hour wall-clock times per ISO 8601 (hours 00–23, minutes and seconds 00–59; the 24:00 form is
// refused), and years held to the light engine's own range, checked by asking the engine.
import { isExists } from 'date-fns'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { LIGHT_FIRST_YEAR, LIGHT_LAST_YEAR } from '../../shared/light'
import { describeDateTimeProblem, FIRST_YEAR, isCalendarDate, LAST_YEAR, WallClockTimeSchema } from '../../shared/schemas/calendar'
import { InstantSchema, LocalDateSchema } from '../../shared/schemas/fields'
import { computeSeasons } from '../../server/core/light/seasons'

const OSLO = { latitude: 59.91, longitude: 10.75, timezone: 'Europe/Oslo' }

describe('calendar dates', () => {
  // years 100–9999: isExists builds a local Date, which reads years 0–99 as 1900–1999
  it('agree with date-fns isExists for years 100–9999, months −1 to 14, days −1 to 33', () => {
    fc.assert(fc.property(fc.integer({ min: 100, max: 9999 }), fc.integer({ min: -1, max: 14 }), fc.integer({ min: -1, max: 33 }), (y, m, d) => {
      expect(isCalendarDate(y, m, d), `${y}-${m}-${d}`).toBe(isExists(y, m - 1, d))
    }), { numRuns: 3000 })
  })

  it('know leap years by the Gregorian rule: 2028-02-29 and 2000-02-29 exist, 2100-02-29 and 2027-02-29 do not', () => {
    expect([isCalendarDate(2028, 2, 29), isCalendarDate(2000, 2, 29), isCalendarDate(2100, 2, 29), isCalendarDate(2027, 2, 29)]).toEqual([true, true, false, false])
  })
})

describe('wall-clock times and instants', () => {
  it.each([
    ['2026-02-30T10:00', 'no such date'], ['2026-13-01T10:00', 'no such date'], ['2026-00-10T10:00', 'no such date'],
    ['2026-03-01T10:60', 'minutes'], ['2026-03-01T99:99', 'hours'], ['2026-03-01T24:00', 'hours'], ['2026-03-01T10:00:60', 'seconds'],
    ['0001-01-01T10:00', 'years'], ['1900-12-31T23:59', 'years'], ['1901-12-31T23:59', 'years'], ['2149-01-01T00:00', 'years'], ['2150-01-01T00:00', 'years'], ['9999-06-01T12:00', 'years']
  ])('refuses the local time %s (%s)', (text, why) => {
    const result = WallClockTimeSchema.safeParse(text)
    expect(result.success).toBe(false)
    expect(result.error!.issues[0]!.message).toContain(why)
  })

  it.each(['2026-03-01T00:00', '2026-03-01T23:59', '2028-02-29T12:00:59', `${FIRST_YEAR}-01-01T00:00`, `${LAST_YEAR}-12-31T23:59`])('takes the local time %s', (text) => {
    expect(WallClockTimeSchema.safeParse(text).success).toBe(true)
  })

  it('refuses instants on no calendar, clock or offset, and outside the range; takes real ones', () => {
    for (const bad of ['2026-02-30T10:00:00Z', '2026-03-01T24:00:00Z', '2026-03-01T10:00:00+25:00', '2026-03-01T10:00:00+05:60', '2150-01-01T00:00:00Z', '0001-01-01T00:00:00Z']) {
      expect(InstantSchema.safeParse(bad).success, bad).toBe(false)
    }
    for (const good of ['2026-03-01T10:00:00Z', '2026-03-01T10:00+14:00', '2026-03-01T10:00:00.250-09:30']) {
      expect(InstantSchema.safeParse(good).success, good).toBe(true)
    }
  })

  it('holds local dates to the same range', () => {
    expect(LocalDateSchema.safeParse(`${LAST_YEAR + 1}-01-01`).success).toBe(false)
    expect(LocalDateSchema.safeParse(`${FIRST_YEAR - 1}-12-31`).success).toBe(false)
    expect(LocalDateSchema.safeParse(`${LAST_YEAR}-12-31`).success).toBe(true)
    expect(LocalDateSchema.safeParse('2027-02-29').success).toBe(false)
    expect(LocalDateSchema.safeParse('2028-02-29').success).toBe(true)
    expect(describeDateTimeProblem('2028-02-29')).toBeNull()
  })
})

describe('the year range comes from the light engine\'s own', () => {
  it(`the engine answers for ${LIGHT_FIRST_YEAR} and ${LIGHT_LAST_YEAR} and refuses the years just outside; the product keeps one year inside each end`, () => {
    for (const year of [LIGHT_FIRST_YEAR, LIGHT_LAST_YEAR]) expect(computeSeasons({ ...OSLO, year }).year).toBe(year)
    for (const year of [LIGHT_FIRST_YEAR - 1, LIGHT_LAST_YEAR + 1]) expect(() => computeSeasons({ ...OSLO, year })).toThrow(RangeError)
    expect([FIRST_YEAR, LAST_YEAR]).toEqual([LIGHT_FIRST_YEAR + 1, LIGHT_LAST_YEAR - 1])
  })
})
