// The light engine's own guarantees (partition of every local day, time zones, validation) and the
// published or common-practice facts it must reproduce. Outside sources are named beside each check.
import { describe, expect, it } from 'vitest'
import { computeLightDays, computeLightDaysMs, computeLightPeriodsInRange } from '../../server/core/light/index'
import { isValidTimeZone, shiftLocalDate } from '../../server/core/time/zone-table'
import { BAND_KINDS, BAND_LOWER_ALTITUDE_DEG, type LightDayMs } from '../../shared/light'

const HOUR_MS = 3_600_000

function yearOf(latitude: number, longitude: number, timezone: string, year = 2026) {
  return computeLightDaysMs({ latitude, longitude, timezone, from: `${year}-01-01`, to: `${year}-12-31` })
}

function oneDay(latitude: number, longitude: number, timezone: string, date: string) {
  return computeLightDays({ latitude, longitude, timezone, from: date, to: date })[0]!
}

// Local midnight of a date in a zone, found independently with Intl (not the engine's own tables):
// the first minute whose wall-clock date is this date, by bisection over the 28 h that can hold it.
const INTL_DATE = new Map<string, Intl.DateTimeFormat>()
function intlLocalMidnight(date: string, timezone: string): number {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const wall = Date.UTC(y, m - 1, d)
  if (!INTL_DATE.has(timezone)) INTL_DATE.set(timezone, new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }))
  const format = INTL_DATE.get(timezone)!
  let lo = wall - 14 * HOUR_MS
  let hi = wall + 14 * HOUR_MS
  while (hi - lo > 60_000) {
    const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000
    if (format.format(mid) >= date) hi = mid
    else lo = mid
  }
  return hi
}

// Everything that breaks the partition contract for one day (docs/light-model.md), as text.
function findPartitionProblems(day: LightDayMs, startMs: number, endMs: number): string[] {
  const problems: string[] = []
  const note = (what: string) => problems.push(`${day.date}: ${what}`)
  if (day.startMs !== startMs || day.periods[0]!.startMs !== startMs) note('does not start at local midnight')
  if (day.endMs !== endMs || day.periods[day.periods.length - 1]!.endMs !== endMs) note('does not end at the next local midnight')
  let total = 0
  day.periods.forEach((p, i) => {
    if (!(p.endMs > p.startMs)) note(`empty period ${i}`)
    if (!BAND_KINDS.includes(p.kind)) note(`unknown kind ${p.kind}`)
    if (i > 0 && p.startMs !== day.periods[i - 1]!.endMs) note(`gap or overlap before period ${i}`)
    if (i > 0 && p.kind === day.periods[i - 1]!.kind) note(`unmerged ${p.kind} neighbours`)
    if (i > 0 && !day.events.some(e => e.atMs === p.startMs)) note(`no sun event at the boundary before period ${i}`)
    total += p.endMs - p.startMs
  })
  if (total !== endMs - startMs) note('period lengths do not add up to the day')
  day.events.forEach((e, i) => {
    if (i > 0 && e.atMs < day.events[i - 1]!.atMs) note('events out of order')
    if (e.atMs < startMs || e.atMs >= endMs) note(`event ${e.type} outside the day`)
    if (!(e.azimuth >= 0 && e.azimuth < 360)) note(`azimuth ${e.azimuth}`)
  })
  return problems
}

describe('partition of every local day', () => {
  const sites = [
    { latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
    { latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' },
    { latitude: -77.85, longitude: 166.67, timezone: 'Antarctica/McMurdo' },
    { latitude: -72.01, longitude: 2.53, timezone: 'Antarctica/Troll' },
    { latitude: 64.18, longitude: -51.72, timezone: 'America/Nuuk' },
    { latitude: 60.72, longitude: -135.06, timezone: 'America/Whitehorse' },
    { latitude: 0, longitude: 0, timezone: 'UTC' },
    { latitude: 90, longitude: 0, timezone: 'UTC' },
    { latitude: -90, longitude: 0, timezone: 'Antarctica/McMurdo' }
  ]
  for (const site of sites) {
    it(`is contiguous from local midnight to local midnight every day of 2026 at ${site.latitude}° ${site.timezone}`, () => {
      const days = yearOf(site.latitude, site.longitude, site.timezone)
      expect(days).toHaveLength(365)
      const allowedHours = site.timezone === 'Antarctica/Troll' ? [22, 24, 26] : [23, 24, 25]
      const problems = days.flatMap((day, i) => {
        const found = findPartitionProblems(day, intlLocalMidnight(day.date, site.timezone), intlLocalMidnight(shiftLocalDate(day.date, 1), site.timezone))
        if (day.date !== shiftLocalDate('2026-01-01', i)) found.push(`day ${i} is dated ${day.date}`)
        if (!allowedHours.includes((day.endMs - day.startMs) / HOUR_MS)) found.push(`${day.date} lasts ${(day.endMs - day.startMs) / HOUR_MS} h`)
        return found
      })
      expect(problems).toEqual([])
    })
  }

  it('reports status, minutes and extremes consistent with the periods', () => {
    const problems: string[] = []
    const statuses = new Set<string>()
    for (const day of yearOf(78.22, 15.65, 'Arctic/Longyearbyen')) {
      const sum = (kinds: string[]) => day.periods.filter(p => kinds.includes(p.kind)).reduce((s, p) => s + p.endMs - p.startMs, 0)
      const expected = day.periods.length === 1 && day.periods[0]!.kind === 'day' ? 'midnight-sun' : sum(['day']) === 0 ? 'polar-night' : 'rises-and-sets'
      statuses.add(day.status)
      if (day.daylightMinutes !== Math.round(sum(['day']) / 60_000)) problems.push(`${day.date} daylightMinutes`)
      if (day.civilLightMinutes !== Math.round(sum(['day', 'civil']) / 60_000)) problems.push(`${day.date} civilLightMinutes`)
      if (day.status !== expected) problems.push(`${day.date} status ${day.status}, expected ${expected}`)
      if (!(day.maxAltitude >= day.minAltitude)) problems.push(`${day.date} extremes`)
      if (day.solarNoonMs < day.startMs || day.solarNoonMs >= day.endMs) problems.push(`${day.date} solar noon outside the day`)
    }
    expect(problems).toEqual([])
    expect([...statuses].sort()).toEqual(['midnight-sun', 'polar-night', 'rises-and-sets'])
  })

  it('gives the same days for one-day requests as for a whole-year request', () => {
    const year = yearOf(69.65, 18.96, 'Europe/Oslo')
    for (const i of [0, 37, 88, 140, 171, 250, 297, 364]) {
      const [single] = computeLightDaysMs({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: year[i]!.date, to: year[i]!.date })
      expect(single!.periods.map(p => p.kind)).toEqual(year[i]!.periods.map(p => p.kind))
      single!.periods.forEach((p, k) => expect(Math.abs(p.startMs - year[i]!.periods[k]!.startMs)).toBeLessThanOrEqual(1000))
    }
  })

  it('formats every instant as ISO 8601 with the zone offset, the same instants as the numeric variant', () => {
    const strings = computeLightDays({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: '2026-03-27', to: '2026-03-31' })
    const numbers = computeLightDaysMs({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: '2026-03-27', to: '2026-03-31' })
    const iso = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[+-]\d{2}:\d{2}$/
    strings.forEach((day, i) => {
      day.periods.forEach((p, k) => {
        expect(p.start).toMatch(iso)
        expect(Date.parse(p.start)).toBe(numbers[i]!.periods[k]!.startMs)
        expect(Date.parse(p.end)).toBe(numbers[i]!.periods[k]!.endMs)
      })
      day.events.forEach((e, k) => expect(Date.parse(e.at)).toBe(numbers[i]!.events[k]!.atMs))
      expect(Date.parse(day.solarNoon)).toBe(numbers[i]!.solarNoonMs)
    })
    expect(strings[0]!.periods[0]!.start).toBe('2026-03-27T00:00:00+01:00')
    expect(strings[4]!.periods[0]!.start).toBe('2026-03-31T00:00:00+02:00')
  })

  it('finds a band entered twice in one day', () => {
    // Around 2026-09-18 at 69.65°N the sun dips just below −18° after local midnight, comes back up,
    // and sets through −18° again that evening (astronomy-engine agrees; see light.reference.test.ts).
    const day = computeLightDaysMs({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: '2026-09-18', to: '2026-09-18' })[0]!
    expect(day.periods.filter(p => p.kind === 'night')).toHaveLength(2)
    expect(day.periods.filter(p => p.kind === 'astronomical')).toHaveLength(2)
  })
})

describe('published and common-practice facts', () => {
  it('uses the USNO altitude conventions for the band edges', () => {
    // USNO "Rise, Set, and Twilight Definitions": sunrise/sunset at −50′ (34′ refraction + 16′
    // semidiameter); civil, nautical, astronomical twilight at −6°, −12°, −18° (geometric, disc centre).
    expect(BAND_LOWER_ALTITUDE_DEG).toEqual({ day: -0.833, civil: -6, nautical: -12, astronomical: -18 })
    expect(BAND_LOWER_ALTITUDE_DEG.day).toBeCloseTo(-(34 + 16) / 60, 3)
  })

  it('gives about 12 h 7 min of daylight on the equator at the March equinox', () => {
    // Common practice: with the −0.833° convention an equinox day on the equator is ~12 h 7 min (±2 min).
    const day = oneDay(0, 0, 'UTC', '2026-03-20')
    expect(Math.abs(day.daylightMinutes - (12 * 60 + 7))).toBeLessThanOrEqual(2)
  })

  it('does not set the sun on the Arctic Circle at the June solstice', () => {
    // Arctic Circle 66°33′51″ ≈ 66.56°N (docs/references.md, from the 2026 mean obliquity).
    const day = oneDay(66.56, 25.7, 'Europe/Helsinki', '2026-06-21')
    expect(day.status).toBe('midnight-sun')
    expect(day.events.filter(e => e.type === 'sunset')).toEqual([])
  })

  it('sees the midnight sun at the June solstice from about 65°44′N, not south of it', () => {
    // docs/references.md, "Polar latitudes": with standard refraction the midnight sun is seen on the
    // June solstice from about 65°44′ (65.73°N).
    expect(oneDay(65.9, 25.7, 'Europe/Helsinki', '2026-06-21').status).toBe('midnight-sun')
    expect(oneDay(65.5, 25.7, 'Europe/Helsinki', '2026-06-21').status).toBe('rises-and-sets')
  })

  it('keeps 78°N in polar night at the December solstice, without even civil light', () => {
    // Polar night at 78°N in December (common practice; docs/references.md: civil polar night from 72°34′).
    const day = oneDay(78.22, 15.65, 'Arctic/Longyearbyen', '2026-12-21')
    expect(day.status).toBe('polar-night')
    expect(day.civilLightMinutes).toBe(0)
    expect(oneDay(72.2, 15.65, 'Europe/Oslo', '2026-12-21').civilLightMinutes).toBeGreaterThan(0)
  })

  it('shows the sun about 190 days a year at the North Pole and about 183 at the South Pole', () => {
    // docs/references.md, "Orbital eccentricity" (common practice): the northern summer half-year is about
    // a week longer, so the North Pole sees the sun for about 190 days and the South Pole about 183.
    const daylightDays = (latitude: number) => yearOf(latitude, 0, 'UTC').reduce((sum, d) => sum + d.daylightMinutes, 0) / 1440
    const north = daylightDays(90)
    const south = daylightDays(-90)
    expect(Math.abs(north - 190)).toBeLessThanOrEqual(2)
    expect(Math.abs(south - 183)).toBeLessThanOrEqual(2)
    expect(north - south).toBeGreaterThan(5)
  })

  it('puts the noon sun within 0.1° of the zenith on the Tropic of Cancer at the June solstice', () => {
    // Tropic of Cancer ≈ 23.44°N (the obliquity, common practice; value from memory to 0.01°).
    const day = oneDay(23.44, 0, 'UTC', '2026-06-21')
    expect(day.maxAltitude).toBeGreaterThanOrEqual(89.9)
    expect(Math.abs(Date.parse(day.solarNoon) - Date.parse('2026-06-21T12:00:00+00:00'))).toBeLessThan(10 * 60_000)
  })
})

describe('time zones', () => {
  it('partitions the 23-hour and 25-hour days of Europe/Oslo in 2026 exactly', () => {
    // EU rule (tz data): clocks go forward 2026-03-29 01:00 UTC and back 2026-10-25 01:00 UTC.
    const spring = oneDay(69.65, 18.96, 'Europe/Oslo', '2026-03-29')
    expect(spring.periods[0]!.start).toBe('2026-03-29T00:00:00+01:00')
    expect(spring.periods[spring.periods.length - 1]!.end).toBe('2026-03-30T00:00:00+02:00')
    const autumn = oneDay(78.22, 15.65, 'Arctic/Longyearbyen', '2026-10-25')
    expect(autumn.periods[0]!.start).toBe('2026-10-25T00:00:00+02:00')
    expect(autumn.periods[autumn.periods.length - 1]!.end).toBe('2026-10-26T00:00:00+01:00')
    const [s, a] = [spring, autumn].map(d => d.periods.reduce((sum, p) => sum + Date.parse(p.end) - Date.parse(p.start), 0) / 60_000)
    expect(s).toBe(1380)
    expect(a).toBe(1500)
  })

  it('has only 24-hour days in America/Whitehorse, which keeps −07:00 all year since 2020', () => {
    // tz data: Yukon moved to permanent UTC−7 in 2020.
    const days = computeLightDays({ latitude: 60.72, longitude: -135.06, timezone: 'America/Whitehorse', from: '2026-01-01', to: '2026-12-31' })
    for (const day of days) {
      const first = day.periods[0]!.start
      const last = day.periods[day.periods.length - 1]!.end
      expect(first.endsWith('-07:00') && last.endsWith('-07:00')).toBe(true)
      expect(Date.parse(last) - Date.parse(first)).toBe(24 * HOUR_MS)
    }
  })

  it('shifts Antarctica/Troll by two hours, giving days of 22 and 26 hours', () => {
    // tz data: Troll station keeps +00 in winter and +02 in summer, switching at the EU instants.
    const spring = oneDay(-72.01, 2.53, 'Antarctica/Troll', '2026-03-29')
    expect(spring.periods[0]!.start).toBe('2026-03-29T00:00:00+00:00')
    expect(spring.periods[spring.periods.length - 1]!.end).toBe('2026-03-30T00:00:00+02:00')
    const autumn = oneDay(-72.01, 2.53, 'Antarctica/Troll', '2026-10-25')
    expect(autumn.periods[autumn.periods.length - 1]!.end).toBe('2026-10-26T00:00:00+00:00')
    const hours = [spring, autumn].map(d => (Date.parse(d.periods[d.periods.length - 1]!.end) - Date.parse(d.periods[0]!.start)) / HOUR_MS)
    expect(hours).toEqual([22, 26])
  })

  it('follows America/Nuuk, whose clocks now spring forward late on a Saturday evening', () => {
    // tz data: Greenland moved to −02 in 2023 with summer time −01 from 2024, changing at 01:00 UTC.
    const day = oneDay(64.18, -51.72, 'America/Nuuk', '2026-03-28')
    expect(day.periods[0]!.start).toBe('2026-03-28T00:00:00-02:00')
    expect(day.periods[day.periods.length - 1]!.end).toBe('2026-03-29T00:00:00-01:00')
  })

  it('keeps Antarctica/McMurdo on New Zealand time, with its April 25-hour day', () => {
    const day = oneDay(-77.85, 166.67, 'Antarctica/McMurdo', '2026-04-05')
    expect(day.periods[0]!.start).toBe('2026-04-05T00:00:00+13:00')
    expect(day.periods[day.periods.length - 1]!.end).toBe('2026-04-06T00:00:00+12:00')
  })
})

describe('input handling', () => {
  it('accepts IANA names and rejects offsets and unknown names', () => {
    for (const tz of ['Europe/Oslo', 'Arctic/Longyearbyen', 'UTC', 'Etc/GMT+2', 'Antarctica/Troll']) expect(isValidTimeZone(tz)).toBe(true)
    for (const tz of ['', 'UTC+2', '+02:00', 'GMT+2', 'Mars/Olympus', ' Europe/Oslo']) expect(isValidTimeZone(tz)).toBe(false)
  })

  it('names the field in each error', () => {
    const base = { latitude: 69, longitude: 18, timezone: 'Europe/Oslo', from: '2026-01-01', to: '2026-01-02' }
    expect(() => computeLightDays({ ...base, timezone: 'UTC+2' })).toThrow(/timezone/)
    expect(() => computeLightDays({ ...base, from: '2026-02-30' })).toThrow(/from/)
    expect(() => computeLightDays({ ...base, to: '2025-12-31' })).toThrow(/to must be on or after from/)
    expect(() => computeLightDays({ ...base, to: '2027-01-02' })).toThrow(/at most 366 days/)
    expect(() => computeLightDays({ ...base, latitude: 91 })).toThrow(/latitude/)
    expect(() => computeLightDays({ ...base, longitude: Number.NaN })).toThrow(/longitude/)
  })

  it('computes 366 days, the poles exactly, and any longitude', () => {
    expect(computeLightDaysMs({ latitude: 69, longitude: 18, timezone: 'Europe/Oslo', from: '2028-01-01', to: '2028-12-31' })).toHaveLength(366)
    const pole = oneDay(90, 0, 'UTC', '2026-06-21')
    expect(pole.status).toBe('midnight-sun')
    expect(oneDay(-90, 0, 'UTC', '2026-06-21').status).toBe('polar-night')
    const wrapped = computeLightDaysMs({ latitude: 69, longitude: 200, timezone: 'UTC', from: '2026-05-01', to: '2026-05-01' })[0]!
    const plain = computeLightDaysMs({ latitude: 69, longitude: -160, timezone: 'UTC', from: '2026-05-01', to: '2026-05-01' })[0]!
    expect(wrapped.periods).toEqual(plain.periods)
  })
})

describe('light periods over any instant range', () => {
  it('covers the range contiguously and matches the daily partition', () => {
    const days = computeLightDaysMs({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: '2026-02-10', to: '2026-02-12' })
    const startMs = days[0]!.startMs + 5 * HOUR_MS + 123
    const endMs = days[2]!.startMs + 7 * HOUR_MS
    const bands = computeLightPeriodsInRange(69.65, 18.96, startMs, endMs)
    expect(bands[0]!.startMs).toBe(startMs)
    expect(bands[bands.length - 1]!.endMs).toBe(endMs)
    for (let i = 1; i < bands.length; i++) {
      expect(bands[i]!.startMs).toBe(bands[i - 1]!.endMs)
      expect(bands[i]!.kind).not.toBe(bands[i - 1]!.kind)
    }
    const dayBoundaries = days.flatMap(d => d.periods.slice(1).map(p => p.startMs)).filter(ms => ms > startMs && ms < endMs)
    const rangeBoundaries = bands.slice(1).map(b => b.startMs)
    expect(rangeBoundaries).toHaveLength(dayBoundaries.length)
    rangeBoundaries.forEach((ms, i) => expect(Math.abs(ms - dayBoundaries[i]!)).toBeLessThanOrEqual(1000))
  })

  it('returns nothing for an empty range and rejects a reversed one', () => {
    expect(computeLightPeriodsInRange(69, 18, 1_800_000_000_000, 1_800_000_000_000)).toEqual([])
    expect(() => computeLightPeriodsInRange(69, 18, 1_800_000_000_000, 1_700_000_000_000)).toThrow(/endMs/)
  })
})
