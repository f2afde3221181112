import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { computeLightDays } from '../../server/core/light/index'
import { checkShiftLight } from '../../server/core/light/check'
import { ColdQuerySchema, computeColdFigures } from '../../server/core/cold/index'
import { findShiftConflicts } from '../../server/core/planning/conflicts'
import { LatitudeSchema, LocalDateSchema, TimeZoneSchema } from '../../server/utils/validation'
import { LightQuerySchema } from '../../server/utils/light-query'

// Property-based checks (fast-check): random and hostile input never crashes or hangs the pure
// modules, and what they return keeps its invariants.
const ZONES = ['UTC', 'Europe/Oslo', 'Arctic/Longyearbyen', 'America/Nuuk', 'America/Whitehorse', 'Antarctica/McMurdo', 'Antarctica/Troll', 'Asia/Kolkata', 'Pacific/Chatham']
const HOSTILE = fc.oneof(
  fc.string(), fc.string({ unit: 'grapheme', maxLength: 200 }), fc.constantFrom('', ' ', '1\' OR \'1\'=\'1', '; DROP TABLE shifts; --', 'NaN', 'Infinity', '-Infinity', '1e309', '0x10', '../../etc/passwd', '\u0000', '٣'),
  fc.double(), fc.integer(), fc.constantFrom(Number.NaN, Infinity, -Infinity, 1e308, -1e308), fc.boolean(), fc.constant(null), fc.array(fc.integer(), { maxLength: 3 }), fc.object({ maxDepth: 1 })
)

const dateArb = fc.date({ min: new Date('1950-01-01T00:00:00Z'), max: new Date('2090-12-31T00:00:00Z'), noInvalidDate: true }).map(d => d.toISOString().slice(0, 10))

describe('light engine under random input', () => {
  it('partitions any local day anywhere: contiguous, from local midnight to the next, minutes add up', () => {
    fc.assert(fc.property(
      fc.double({ min: -90, max: 90, noNaN: true }), fc.double({ min: -180, max: 180, noNaN: true }), fc.constantFrom(...ZONES), dateArb,
      (lat, lon, tz, date) => {
        const [day] = computeLightDays({ latitude: lat, longitude: lon, timezone: tz, from: date, to: date })
        expect(day).toBeDefined()
        const periods = day!.periods
        for (let i = 1; i < periods.length; i++) {
          expect(Date.parse(periods[i]!.start)).toBe(Date.parse(periods[i - 1]!.end))
          expect(periods[i]!.kind).not.toBe(periods[i - 1]!.kind)
        }
        const length = (Date.parse(periods.at(-1)!.end) - Date.parse(periods[0]!.start)) / 60_000
        expect([1320, 1380, 1410, 1440, 1470, 1500, 1560]).toContain(Math.round(length))
        expect(day!.daylightMinutes).toBeLessThanOrEqual(day!.civilLightMinutes)
        expect(day!.civilLightMinutes).toBeLessThanOrEqual(Math.round(length))
      }
    ), { numRuns: 150 })
  })

  it('gives every shift a light check between 0 and its length, and none below requirement when the area is lit', () => {
    fc.assert(fc.property(
      fc.double({ min: -90, max: 90, noNaN: true }), fc.double({ min: -180, max: 180, noNaN: true }),
      fc.integer({ min: Date.parse('2000-01-01'), max: Date.parse('2060-01-01') }), fc.integer({ min: 1, max: 7 * 24 * 60 }),
      fc.constantFrom('daylight' as const, 'civil' as const, 'any' as const),
      (lat, lon, startMs, minutes, requirement) => {
        const check = checkShiftLight({ latitude: lat, longitude: lon, startMs, endMs: startMs + minutes * 60_000, requirement })
        expect(check.minutesBelow).toBeGreaterThanOrEqual(0)
        expect(check.minutesBelow).toBeLessThanOrEqual(minutes)
        expect(check.flagged).toBe(check.minutesBelow >= 1)
        if (requirement === 'any') expect(check.minutesBelow).toBe(0)
      }
    ), { numRuns: 200 })
  })
})

describe('input schemas under hostile input', () => {
  it('never throw: they accept or answer with issues that name a field', () => {
    fc.assert(fc.property(HOSTILE, HOSTILE, HOSTILE, HOSTILE, HOSTILE, (lat, lon, tz, from, to) => {
      const result = LightQuerySchema.safeParse({ lat, lon, tz, from, to })
      if (!result.success) expect(result.error.issues.every(issue => issue.path.length > 0)).toBe(true)
    }), { numRuns: 500 })
  })

  it('accept only finite latitudes within ±90, real dates and known zones', () => {
    fc.assert(fc.property(HOSTILE, (value) => {
      const lat = LatitudeSchema.safeParse(value)
      if (lat.success) expect(Math.abs(lat.data)).toBeLessThanOrEqual(90)
      const date = LocalDateSchema.safeParse(value)
      if (date.success) expect(Number.isNaN(Date.parse(date.data))).toBe(false)
      const tz = TimeZoneSchema.safeParse(value)
      if (tz.success) expect(() => new Intl.DateTimeFormat('en', { timeZone: tz.data })).not.toThrow()
    }), { numRuns: 1000 })
  })

  it('turn any cold query into figures or a field error, never NaN', () => {
    fc.assert(fc.property(HOSTILE, HOSTILE, fc.oneof(HOSTILE, fc.constantFrom('metric', 'imperial')), (temperature, wind, units) => {
      const parsed = ColdQuerySchema.safeParse({ temperature, wind, units })
      if (!parsed.success) {
        expect(parsed.error.issues[0]!.path.length).toBeGreaterThan(0)
        return
      }
      const figures = computeColdFigures(parsed.data)
      if (figures.windChill !== null) expect(Number.isFinite(figures.windChill)).toBe(true)
      if (figures.warmup.maxWorkMinutes !== null) expect(Number.isFinite(figures.warmup.maxWorkMinutes)).toBe(true)
    }), { numRuns: 1000 })
  })
})

describe('conflict rules under random shifts', () => {
  it('report an overlap exactly when one person is on two shifts at once', () => {
    const span = fc.record({ start: fc.integer({ min: 0, max: 10_000 }), length: fc.integer({ min: 1, max: 2_000 }) })
    fc.assert(fc.property(span, fc.array(span, { maxLength: 6 }), (candidate, others) => {
      const MIN = 60_000
      const conflicts = findShiftConflicts(
        { startMs: candidate.start * MIN, endMs: (candidate.start + candidate.length) * MIN, personIds: [7] },
        { otherShifts: others.map((o, i) => ({ shiftId: i + 1, personId: 7, startMs: o.start * MIN, endMs: (o.start + o.length) * MIN, title: `t${i}`, siteName: 's' })), unavailable: [], personNames: { 7: 'P' } },
        { minRestHours: 11, maxShiftHours: 12 }
      )
      const overlapping = others.filter(o => o.start < candidate.start + candidate.length && candidate.start < o.start + o.length).length
      expect(conflicts.filter(c => c.kind === 'overlap').length).toBe(overlapping)
      expect(conflicts.every(c => typeof c.message === 'string' && c.message.length > 0)).toBe(true)
    }), { numRuns: 500 })
  })
})
