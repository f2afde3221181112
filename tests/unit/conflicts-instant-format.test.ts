import { formatInTimeZone, fromZonedTime } from 'date-fns-tz'
import { describe, expect, it } from 'vitest'
import { resolveWallTimeOnce } from '../../server/core/time/instant-format'
import { formatZonedIso } from '../../server/core/time/zoned'

// The shift lists format their times with formatZonedIso for speed; the reference is date-fns-tz
// (npm), the library behind formatZonedIso, with the pattern the API has always used.
const REFERENCE_PATTERN = 'yyyy-MM-dd\'T\'HH:mm:ssXXX'
const ZONES = ['Europe/Oslo', 'Arctic/Longyearbyen', 'America/Nuuk', 'America/Whitehorse', 'Antarctica/McMurdo', 'UTC', 'Europe/London', 'America/St_Johns', 'Asia/Kathmandu', 'Australia/Lord_Howe', 'Pacific/Chatham', 'Antarctica/Troll']

describe('formatZonedIso', () => {
  it('writes the same text as date-fns-tz for every zone, every six hours or so over two years', () => {
    const mismatches: string[] = []
    for (let ms = Date.UTC(2026, 0, 1); ms < Date.UTC(2028, 0, 1); ms += 6 * 3_600_000 + 7 * 60_000 + 13_500) {
      for (const zone of ZONES) {
        const reference = formatInTimeZone(ms, zone, REFERENCE_PATTERN)
        if (formatZonedIso(ms, zone) !== reference) mismatches.push(`${zone} ${ms} ${formatZonedIso(ms, zone)} ≠ ${reference}`)
      }
    }
    expect(mismatches).toEqual([])
  })

  it('agrees on both sides of the EU changes of 2027 and a zero offset', () => {
    // EU summer time 2027: from 01:00 UTC on 28 March to 01:00 UTC on 31 October (Directive 2000/84/EC)
    for (const ms of [Date.UTC(2027, 2, 28, 0, 59, 59), Date.UTC(2027, 2, 28, 1), Date.UTC(2027, 9, 31, 0, 59, 59), Date.UTC(2027, 9, 31, 1)]) {
      expect(formatZonedIso(ms, 'Europe/Oslo')).toBe(formatInTimeZone(ms, 'Europe/Oslo', REFERENCE_PATTERN))
    }
    expect(formatZonedIso(Date.UTC(2027, 2, 28, 1), 'Europe/Oslo')).toBe('2027-03-28T03:00:00+02:00')
    expect(formatZonedIso(Date.UTC(2027, 0, 5, 12, 0, 0, 999), 'UTC')).toBe('2027-01-05T12:00:00Z')
  })
})

describe('resolveWallTimeOnce', () => {
  it('finds the same instant as date-fns-tz fromZonedTime for times that happen once, and declines gaps and overlaps', () => {
    const mismatches: string[] = []
    let declined = 0
    for (let ms = Date.UTC(2026, 0, 1); ms < Date.UTC(2028, 0, 1); ms += 7 * 3_600_000 + 11 * 60_000) {
      for (const zone of ZONES) {
        const wall = formatInTimeZone(ms, zone, 'yyyy-MM-dd\'T\'HH:mm:ss')
        const found = resolveWallTimeOnce(wall, zone)
        if (found === null) {
          declined++
          continue
        }
        const reference = fromZonedTime(wall, zone).getTime()
        if (found !== reference) mismatches.push(`${zone} ${wall} ${found} ≠ ${reference}`)
      }
    }
    expect(mismatches).toEqual([])
    // only the hour around each autumn change is declined (an hour that happens twice)
    expect(declined).toBeLessThan(60)
  })

  it('declines a time in the spring gap and one in the autumn overlap (Europe/Oslo 2027)', () => {
    // EU summer time 2027 (Directive 2000/84/EC): clocks 02:00 → 03:00 on 28 March, 03:00 → 02:00 on 31 October
    expect(resolveWallTimeOnce('2027-03-28T02:30:00', 'Europe/Oslo')).toBeNull()
    expect(resolveWallTimeOnce('2027-10-31T02:30:00', 'Europe/Oslo')).toBeNull()
    expect(resolveWallTimeOnce('2027-10-31T03:30:00', 'Europe/Oslo')).toBe(Date.UTC(2027, 9, 31, 2, 30))
    // Lord Howe Island moves its clocks by 30 min (tz database, from memory): 01:45 on 4 April 2027 happens twice
    expect(resolveWallTimeOnce('2027-04-04T01:45:00', 'Australia/Lord_Howe')).toBeNull()
  })
})
