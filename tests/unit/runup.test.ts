import { describe, expect, it } from 'vitest'
import { computeRunup, findNextTransition, summarizeRunup } from '../../server/core/light/runup'
import type { LightDayMs } from '../../shared/light'
import { daysApart, nextDate, referenceDays, type ReferenceDay } from '../support/outlook-reference'

// Reference: astronomy-engine (npm), geometric altitude of the sun's centre sampled every 10 minutes
// over each local day (tests/support/outlook-reference.ts). Sunrise means the centre rising
// through −0.833°, civil light means −6° or higher (USNO conventions, docs/light-model.md). The issue asks for
// the run-up dates within a day of the reference.

interface RefRunup {
  fallsBelow: string | null
  reaches: string | null
  polarNightBegins: string | null
  firstSunriseAfter: string | null
  lastSunrise: string | null
  daysLeft: number | null
}

// The run-up from the reference's days; `at` is the index of the `from` date.
function summarizeReference(days: ReferenceDay[], at: number, minCivilHours: number): RefRunup {
  const ok = (d: ReferenceDay) => d.civilMinutes >= minCivilHours * 60
  const find = (start: number, test: (i: number) => boolean) => {
    for (let i = start; i < days.length; i++) if (test(i)) return i
    return -1
  }
  const falls = find(at + 1, i => !ok(days[i]!) && ok(days[i - 1]!))
  const reaches = find(at + 1, i => ok(days[i]!) && !ok(days[i - 1]!))
  let night = find(at, i => days[i]!.polarNight)
  while (night > 0 && days[night - 1]!.polarNight) night--
  const end = night < 0 ? -1 : find(night, i => !days[i]!.polarNight)
  let rise = -1
  for (let i = night - 1; i >= 0 && rise < 0; i--) if (days[i]!.hasSunrise) rise = i
  const date = (i: number) => (i >= 0 ? days[i]!.date : null)
  return {
    fallsBelow: date(falls),
    reaches: date(reaches),
    polarNightBegins: night > 0 ? date(night) : null,
    firstSunriseAfter: date(end),
    lastSunrise: night > 0 ? date(rise) : null,
    daysLeft: !ok(days[at]!) ? 0 : falls < 0 ? null : falls - at
  }
}

function expectWithinADay(actual: string | null, expected: string | null, what: string) {
  expect(actual === null, `${what}: engine ${actual}, reference ${expected}`).toBe(expected === null)
  if (actual && expected) expect(daysApart(actual, expected), `${what}: engine ${actual}, reference ${expected}`).toBeLessThanOrEqual(1)
}

const KVITFJELL = { latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen' }
const RAVNVIK = { latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }
const TAMARACK = { latitude: 62.454, longitude: -135.357, timezone: 'America/Whitehorse' }
const LOOKBACK = 190

function compare(place: typeof KVITFJELL, from: string, minCivilHours: number) {
  const runup = computeRunup({ siteId: 1, ...place, from, minCivilHours })
  const refStart = nextDate(from, -LOOKBACK)
  const ref = summarizeReference(referenceDays(place.latitude, place.longitude, place.timezone, refStart, LOOKBACK + 400), LOOKBACK, minCivilHours)
  expectWithinADay(runup.civilLightFallsBelow, ref.fallsBelow, 'civil light falls below N hours')
  expectWithinADay(runup.civilLightReaches, ref.reaches, 'civil light reaches N hours')
  expectWithinADay(runup.polarNightBegins, ref.polarNightBegins, 'polar night begins')
  expectWithinADay(runup.firstSunriseAfterPolarNight, ref.firstSunriseAfter, 'first sunrise after polar night')
  expectWithinADay(runup.lastSunrise, ref.lastSunrise, 'last sunrise')
  expect(runup.daysLeftWithCivilHours === null).toBe(ref.daysLeft === null)
  if (runup.daysLeftWithCivilHours !== null) expect(Math.abs(runup.daysLeftWithCivilHours - ref.daysLeft!)).toBeLessThanOrEqual(1)
  return runup
}

describe('run-up to polar night, against astronomy-engine', () => {
  it('at 78°N in September: days left with 4 h of civil light, last sunrise, polar night and the sun\'s return', () => {
    const runup = compare(KVITFJELL, '2026-09-20', 4)
    expect(runup.trend).toBe('darkening')
    // the order of events on the way into the dark, whatever the exact dates
    expect(runup.lastSunrise! < runup.polarNightBegins!).toBe(true)
    expect(runup.polarNightBegins! < runup.firstSunriseAfterPolarNight!).toBe(true)
    expect(runup.daysLeftWithCivilHours).toBeGreaterThan(20)
  }, 60_000)

  it('at 69°N in October with a 6-hour need', () => {
    const runup = compare(RAVNVIK, '2026-10-15', 6)
    expect(runup.trend).toBe('darkening')
    expect(runup.polarNightDays).toBeGreaterThan(30)
  }, 60_000)

  it('at 78°N inside polar night: when it began, the first sunrise and when 4 h of civil light return', () => {
    const runup = compare(KVITFJELL, '2027-01-05', 4)
    expect(runup.today.status).toBe('polar-night')
    expect(runup.trend).toBe('brightening')
    expect(runup.daysLeftWithCivilHours).toBe(0)
    expect(runup.polarNightBegins! < '2027-01-05').toBe(true)
  }, 60_000)

  it('at 69°N inside polar night', () => {
    const runup = compare(RAVNVIK, '2027-01-05', 2)
    expect(runup.today.status).toBe('polar-night')
  }, 60_000)

  it('at 62°N, where the sun rises every day: no polar night, but 8 h of civil light still runs out', () => {
    const runup = compare(TAMARACK, '2026-11-01', 8)
    expect(runup.polarNightBegins).toBeNull()
    expect(runup.lastSunrise).toBeNull()
    expect(runup.firstSunriseAfterPolarNight).toBeNull()
    expect(runup.civilLightFallsBelow).not.toBeNull()
  }, 60_000)
})

// Hand-made days for the counting rules (invented figures, not astronomy).
function fakeDays(from: string, civil: number[], polar: boolean[] = []): LightDayMs[] {
  return civil.map((minutes, i) => ({
    date: nextDate(from, i), startMs: i * 86_400_000, endMs: (i + 1) * 86_400_000,
    periods: [{ kind: 'civil' as const, startMs: i * 86_400_000, endMs: i * 86_400_000 + minutes * 60_000 }, { kind: 'night' as const, startMs: i * 86_400_000 + minutes * 60_000, endMs: (i + 1) * 86_400_000 }],
    events: polar[i] ? [] : [{ type: 'sunrise' as const, atMs: i * 86_400_000 + 3_600_000, azimuth: 90 }],
    solarNoonMs: 0, maxAltitude: 10 - i, minAltitude: -20, daylightMinutes: polar[i] ? 0 : minutes, civilLightMinutes: minutes,
    status: polar[i] ? 'polar-night' as const : 'rises-and-sets' as const
  }))
}

describe('run-up counting rules', () => {
  it('counts today among the days left, and stops the day before civil light falls below N', () => {
    const runup = summarizeRunup(fakeDays('2027-01-01', [300, 260, 241, 239, 200]), '2027-01-01', 4, { siteId: 1, timezone: 'UTC' })
    expect(runup.daysLeftWithCivilHours).toBe(3)
    expect(runup.civilLightFallsBelow).toBe('2027-01-04')
  })

  it('gives 0 days left when today is already below N, and no fall within the data', () => {
    const runup = summarizeRunup(fakeDays('2027-01-01', [100, 90, 80]), '2027-01-01', 4, { siteId: 1, timezone: 'UTC' })
    expect(runup.daysLeftWithCivilHours).toBe(0)
    expect(runup.civilLightFallsBelow).toBeNull()
  })

  it('finds the last sunrise, the polar night and the first sunrise after it', () => {
    const days = fakeDays('2027-01-01', [300, 250, 230, 100, 0, 0, 50], [false, false, false, false, true, true, false])
    const runup = summarizeRunup(days, '2027-01-01', 4, { siteId: 1, timezone: 'UTC' })
    expect(runup.lastSunrise).toBe('2027-01-04')
    expect(runup.polarNightBegins).toBe('2027-01-05')
    expect(runup.firstSunriseAfterPolarNight).toBe('2027-01-07')
    expect(runup.polarNightDays).toBe(2)
    expect(runup.civilLightFallsBelow).toBe('2027-01-03')
  })

  it('names the soonest of the next changes for the light board, skipping those already passed', () => {
    const next = {
      today: '2027-01-10', minCivilHours: 4, status: 'rises-and-sets' as const, civilLightMinutes: 300,
      polarNightBegins: '2027-01-20', polarNightEnds: '2027-03-01', midnightSunBegins: null, midnightSunEnds: null,
      civilLightFallsBelow: '2027-01-14', civilLightReaches: '2027-01-02'
    }
    expect(findNextTransition(next)).toEqual({ kind: 'civil-falls-below', date: '2027-01-14', inDays: 4 })
    expect(findNextTransition({ ...next, civilLightFallsBelow: null, polarNightBegins: null, polarNightEnds: null })).toBeNull()
  })
})
