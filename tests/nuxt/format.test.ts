import { describe, expect, it } from 'vitest'
import {
  addDays, formatDate, formatDay, formatDecimalDegrees, formatDms, formatDuration, formatLocalTime,
  formatTimeRange, formatUtcOffset, fromWallClock, parseCoordinate, toWallClock, zoneOffsetMinutes
} from '../../shared/format'

// Zeller's congruence (Gregorian form), an outside check of weekdays: 0 = Saturday … 6 = Friday.
function zellerWeekday(y: number, m: number, d: number) {
  if (m < 3) {
    m += 12
    y -= 1
  }
  const k = y % 100
  const j = Math.floor(y / 100)
  return (d + Math.floor((13 * (m + 1)) / 5) + k + Math.floor(k / 4) + Math.floor(j / 4) + 5 * j) % 7
}
const ZELLER_NAMES = ['Sat', 'Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri']

describe('local times in IANA zones', () => {
  // EU summer time (Directive 2000/84/EC): CET = UTC+1 in winter, CEST = UTC+2 from the last Sunday
  // of March to the last Sunday of October, changing at 01:00 UTC.
  it('shows 13:05 UTC in mid-January as 14:05 in Oslo (CET, UTC+1)', () => {
    expect(formatLocalTime('2027-01-14T13:05:00Z', 'Europe/Oslo')).toBe('14:05')
    expect(formatUtcOffset('2027-01-14T13:05:00Z', 'Europe/Oslo')).toBe('UTC+01:00')
  })

  it('shows 12:05 UTC in mid-July as 14:05 in Oslo (CEST, UTC+2)', () => {
    expect(formatLocalTime('2027-07-14T12:05:00Z', 'Europe/Oslo')).toBe('14:05')
    expect(zoneOffsetMinutes('2027-07-14T12:05:00Z', 'Europe/Oslo')).toBe(120)
  })

  it('changes Oslo clocks at 01:00 UTC on the last Sunday of March 2027 (28 March)', () => {
    // the last Sunday of March 2027, by Zeller's congruence: 28 March is a Sunday
    expect(ZELLER_NAMES[zellerWeekday(2027, 3, 28)]).toBe('Sun')
    expect(toWallClock('2027-03-28T00:59:00Z', 'Europe/Oslo')).toBe('2027-03-28T01:59:00')
    expect(toWallClock('2027-03-28T01:00:00Z', 'Europe/Oslo')).toBe('2027-03-28T03:00:00')
  })

  it('shows a 24-hour clock, never AM/PM, including midnight as 00:00', () => {
    expect(formatLocalTime('2027-01-14T23:00:00Z', 'Europe/Oslo')).toBe('00:00')
    expect(formatLocalTime('2027-01-14T21:30:00Z', 'Europe/Oslo')).toBe('22:30')
  })

  // Yukon keeps UTC−7 all year since November 2020 (from memory; the IANA tz database records it
  // for America/Whitehorse).
  it('shows Whitehorse as UTC−7 in January', () => {
    expect(formatUtcOffset('2027-01-14T12:00:00Z', 'America/Whitehorse')).toBe('UTC−07:00')
    expect(formatLocalTime('2027-01-14T12:00:00Z', 'America/Whitehorse')).toBe('05:00')
  })

  it('reads a wall-clock time back to the instant it names', () => {
    expect(new Date(fromWallClock('2027-03-02T17:00', 'Arctic/Longyearbyen')).toISOString()).toBe('2027-03-02T16:00:00.000Z')
    expect(new Date(fromWallClock('2027-01-14T05:00', 'America/Whitehorse')).toISOString()).toBe('2027-01-14T12:00:00.000Z')
  })

  it('reads a time in the spring-forward gap one hour later, as the server does (02:30 → 03:30)', () => {
    // 02:00–03:00 does not exist in Oslo on 28 March 2027 (EU rule above)
    const ms = fromWallClock('2027-03-28T02:30', 'Europe/Oslo')
    expect(toWallClock(ms, 'Europe/Oslo')).toBe('2027-03-28T03:30:00')
  })

  it('reads a time in the autumn overlap as the earlier of the two instants (CEST)', () => {
    // 02:00–03:00 happens twice on 31 October 2027, the last Sunday of October
    expect(ZELLER_NAMES[zellerWeekday(2027, 10, 31)]).toBe('Sun')
    expect(new Date(fromWallClock('2027-10-31T02:30', 'Europe/Oslo')).toISOString()).toBe('2027-10-31T00:30:00.000Z')
  })
})

describe('dates and durations in the house format', () => {
  it('writes dates as weekday, day and month (`Tue 14 Jan`), weekday checked by Zeller\'s congruence', () => {
    expect(ZELLER_NAMES[zellerWeekday(2025, 1, 14)]).toBe('Tue')
    expect(formatDate('2025-01-14')).toBe('Tue 14 Jan')
    for (const [y, m, d] of [[2026, 12, 1], [2027, 2, 28], [2028, 2, 29], [2027, 3, 1]] as const) {
      const date = `${y}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`
      expect(formatDate(date).split(' ')[0]).toBe(ZELLER_NAMES[zellerWeekday(y, m, d)])
    }
  })

  it('gives the local date of an instant, which can be the next day in the site\'s zone', () => {
    expect(formatDay('2027-01-14T23:30:00Z', 'Europe/Oslo')).toBe('Fri 15 Jan')
    expect(formatDay('2027-01-14T23:30:00Z', 'America/Whitehorse')).toBe('Thu 14 Jan')
  })

  it('writes durations as hours and minutes', () => {
    expect(formatDuration(205)).toBe('3 h 25 min')
    expect(formatDuration(45)).toBe('45 min')
    expect(formatDuration(120)).toBe('2 h')
    expect(formatDuration(0)).toBe('0 min')
    expect(formatDuration(59.6)).toBe('1 h')
  })

  it('adds days across month and leap-year ends', () => {
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29')
    expect(addDays('2027-02-28', 1)).toBe('2027-03-01')
    expect(addDays('2027-01-01', -1)).toBe('2026-12-31')
  })

  it('shows the end day of a range that crosses local midnight', () => {
    expect(formatTimeRange('2027-01-14T19:00:00+01:00', '2027-01-15T03:00:00+01:00', 'Europe/Oslo')).toBe('19:00–Fri 15 Jan 03:00 Europe/Oslo')
    expect(formatTimeRange('2027-01-14T09:00:00+01:00', '2027-01-14T13:00:00+01:00', 'Europe/Oslo')).toBe('09:00–13:00 Europe/Oslo')
  })
})

// 1° = 60′ = 3600″ (definition of the sexagesimal degree); signs per ISO 6709: north and east
// positive, south and west negative.
describe('coordinates typed either way', () => {
  it('reads degrees and minutes with a hemisphere letter', () => {
    expect(parseCoordinate('78°13′N')).toBeCloseTo(78 + 13 / 60, 6)
    expect(parseCoordinate('78°13\'N', 'lat')).toBeCloseTo(78 + 13 / 60, 6)
  })

  it('reads degrees, minutes and seconds separated by spaces', () => {
    expect(parseCoordinate('78 13 24 N', 'lat')).toBeCloseTo(78 + 13 / 60 + 24 / 3600, 6)
    expect(parseCoordinate('N 78 13.4', 'lat')).toBeCloseTo(78 + 13.4 / 60, 6)
  })

  it('reads signed decimal degrees, also with a decimal comma', () => {
    expect(parseCoordinate('-51.72')).toBe(-51.72)
    expect(parseCoordinate('78,2232', 'lat')).toBe(78.2232)
  })

  it('makes south and west negative', () => {
    expect(parseCoordinate('51°43′12″W', 'lon')).toBeCloseTo(-51.72, 6)
    expect(parseCoordinate('77°50′46″ S', 'lat')).toBeCloseTo(-(77 + 50 / 60 + 46 / 3600), 6)
  })

  it('refuses what cannot be a coordinate', () => {
    expect(parseCoordinate('95 N', 'lat')).toBeNull()
    expect(parseCoordinate('181', 'lon')).toBeNull()
    expect(parseCoordinate('78 61 N', 'lat')).toBeNull()
    expect(parseCoordinate('78 13 60 N', 'lat')).toBeNull()
    expect(parseCoordinate('15 E', 'lat')).toBeNull()
    expect(parseCoordinate('-78 N', 'lat')).toBeNull()
    expect(parseCoordinate('78.5 13 N', 'lat')).toBeNull()
    expect(parseCoordinate('north', 'lat')).toBeNull()
    expect(parseCoordinate('')).toBeNull()
  })

  it('writes degrees, minutes and whole seconds with the hemisphere', () => {
    // 78.2232° = 78° + 0.2232 × 60′ = 78°13.392′ = 78°13′23.5″ → 24″ rounded
    expect(formatDms(78.2232, 'lat')).toBe('78°13′24″ N')
    expect(formatDms(-51.0986, 'lon')).toBe('51°05′55″ W')
    expect(formatDms(-77.846, 'lat')).toBe('77°50′46″ S')
    // 59.9999° carries into the next degree rather than showing 60″
    expect(formatDms(59.99999, 'lat')).toBe('60°00′00″ N')
    expect(formatDecimalDegrees(-135.357, 'lon')).toBe('135.3570° W')
  })

  it('reads its own DMS output back within a second of arc', () => {
    for (const value of [78.2232, -51.0986, 166.676, -77.846, 0.0001]) {
      const axis = Math.abs(value) > 90 ? 'lon' : 'lat'
      expect(Math.abs(parseCoordinate(formatDms(value, axis), axis)! - value)).toBeLessThanOrEqual(1 / 3600)
    }
  })
})
