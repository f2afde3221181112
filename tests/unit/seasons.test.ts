// Season summaries against astronomy-engine 2.1.19: its Seasons() for the solstices and equinoxes,
// and its meridian passages (SearchHourAngle) with unrefracted altitude for polar night and midnight sun.
import { Seasons } from 'astronomy-engine'
import { describe, expect, it } from 'vitest'
import { computeLightDaysMs } from '../../server/core/light/index'
import { shiftLocalDate } from '../../server/core/time/zone-table'
import { computeSeasonInstants, computeSeasons, findNextTransitions } from '../../server/core/light/seasons'
import { referenceAzimuth, referenceDayExtremesByHourAngle } from '../support/sun-reference'

const MINUTE_MS = 60_000

interface Span { from: string, to: string }

function dayDiff(a: string, b: string): number {
  return Math.abs(Date.parse(`${a}T00:00:00Z`) - Date.parse(`${b}T00:00:00Z`)) / 86_400_000
}

// Spans of consecutive dates for which the reference's daily extremes pass the test.
function referenceSpans(latitude: number, longitude: number, timezone: string, year: number, test: (e: { max: number, min: number }) => boolean): Span[] {
  const days = computeLightDaysMs({ latitude, longitude, timezone, from: `${year}-01-01`, to: `${year}-12-31` })
  const spans: Span[] = []
  let open: Span | null = null
  for (const day of days) {
    if (!test(referenceDayExtremesByHourAngle(latitude, longitude, day.startMs, day.endMs))) {
      open = null
      continue
    }
    if (open) open.to = day.date
    else spans.push(open = { from: day.date, to: day.date })
  }
  return spans
}

function expectSpansClose(ours: Span[], reference: Span[]) {
  expect(ours.length).toBe(reference.length)
  ours.forEach((span, i) => {
    expect(dayDiff(span.from, reference[i]!.from)).toBeLessThanOrEqual(1)
    expect(dayDiff(span.to, reference[i]!.to)).toBeLessThanOrEqual(1)
  })
}

describe('solstices and equinoxes', () => {
  it('are within 15 minutes of astronomy-engine\'s Seasons() for 2024–2032', () => {
    let worst = 0
    for (let year = 2024; year <= 2032; year++) {
      const ours = computeSeasonInstants(year)
      const theirs = Seasons(year)
      const pairs: [number, Date][] = [
        [ours.marchEquinoxMs, theirs.mar_equinox.date],
        [ours.juneSolsticeMs, theirs.jun_solstice.date],
        [ours.septemberEquinoxMs, theirs.sep_equinox.date],
        [ours.decemberSolsticeMs, theirs.dec_solstice.date]
      ]
      for (const [ms, date] of pairs) worst = Math.max(worst, Math.abs(ms - date.getTime()) / MINUTE_MS)
    }
    console.info(`solstices/equinoxes 2024–2032: worst difference from astronomy-engine ${worst.toFixed(1)} min`)
    expect(worst).toBeLessThanOrEqual(15)
  })

  it('are given in the site\'s offset', () => {
    const summary = computeSeasons({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', year: 2026 })
    expect(summary.marchEquinox).toMatch(/^2026-03-20T\d{2}:\d{2}:\d{2}\+01:00$/)
    expect(summary.juneSolstice).toMatch(/^2026-06-21T\d{2}:\d{2}:\d{2}\+02:00$/)
    expect(Date.parse(summary.juneSolstice)).toBe(Math.round(computeSeasonInstants(2026).juneSolsticeMs / 1000) * 1000)
  })
})

describe('polar night and midnight sun spans', () => {
  const sites = [
    { name: '69.65°N', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
    { name: '78.22°N', latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' },
    { name: '77.85°S', latitude: -77.85, longitude: 166.67, timezone: 'Antarctica/McMurdo' }
  ]
  for (const site of sites) {
    it(`match the reference within a day at ${site.name} in 2026`, () => {
      const summary = computeSeasons({ ...site, year: 2026 })
      expectSpansClose(summary.polarNight, referenceSpans(site.latitude, site.longitude, site.timezone, 2026, e => e.max < -0.833))
      expectSpansClose(summary.midnightSun, referenceSpans(site.latitude, site.longitude, site.timezone, 2026, e => e.min >= -0.833))
      expect(summary.midnightSun.length).toBeGreaterThan(0)
      expect(summary.polarNight.length).toBeGreaterThan(0)
    })
  }

  it('finds the days without civil light at 78°N, as the reference does', () => {
    const site = sites[1]!
    const summary = computeSeasons({ ...site, year: 2026 })
    expectSpansClose(summary.noCivilLight, referenceSpans(site.latitude, site.longitude, site.timezone, 2026, e => e.max < -6))
    expect(computeSeasons({ ...sites[0]!, year: 2026 }).noCivilLight).toEqual([])
  })
})

describe('season summary details', () => {
  it('gives the first and last days with at least N hours of civil light, or null', () => {
    const summary = computeSeasons({ latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen', year: 2026, minCivilHours: 4 })
    expect(summary.minCivilHours).toBe(4)
    const days = computeLightDaysMs({ latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen', from: '2026-01-01', to: '2026-12-31' })
    const civil = (date: string) => days.find(d => d.date === date)!.periods.filter(p => p.kind === 'day' || p.kind === 'civil').reduce((s, p) => s + p.endMs - p.startMs, 0)
    expect(civil(summary.firstDayWithCivilHours!)).toBeGreaterThanOrEqual(4 * 3_600_000)
    expect(civil(shiftLocalDate(summary.firstDayWithCivilHours!, -1))).toBeLessThan(4 * 3_600_000)
    expect(civil(summary.lastDayWithCivilHours!)).toBeGreaterThanOrEqual(4 * 3_600_000)
    expect(civil(shiftLocalDate(summary.lastDayWithCivilHours!, 1))).toBeLessThan(4 * 3_600_000)
    // The equator never has 14 h of civil light (about 12 h 50 min all year, common practice).
    const equator = computeSeasons({ latitude: 0, longitude: 0, timezone: 'UTC', year: 2026, minCivilHours: 14 })
    expect(equator.firstDayWithCivilHours).toBeNull()
    expect(equator.lastDayWithCivilHours).toBeNull()
  })

  it('gives the sunrises farthest north and south, with azimuths the reference confirms', () => {
    const summary = computeSeasons({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', year: 2026 })
    const days = computeLightDaysMs({ latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo', from: '2026-01-01', to: '2026-12-31' })
    for (const bearing of [summary.northernmostSunrise!, summary.southernmostSunrise!]) {
      const sunrise = days.find(d => d.date === bearing.date)!.events.find(e => e.type === 'sunrise')!
      expect(sunrise.azimuth).toBe(bearing.azimuth)
      expect(Math.abs(referenceAzimuth(sunrise.atMs, 69.65, 18.96) - bearing.azimuth)).toBeLessThan(0.3)
    }
    expect(summary.northernmostSunrise!.azimuth).toBeLessThan(20)
    expect(summary.southernmostSunrise!.azimuth).toBeGreaterThan(160)
    // On the equator the June-solstice sunrise is about 90° − 23.44° = 66.6° (common practice).
    const equator = computeSeasons({ latitude: 0, longitude: 0, timezone: 'UTC', year: 2026 })
    expect(Math.abs(equator.northernmostSunrise!.azimuth - 66.6)).toBeLessThan(0.5)
    expect(Math.abs(equator.southernmostSunrise!.azimuth - 113.4)).toBeLessThan(0.5)
  })

  it('rejects a year outside 1901–2149 and an impossible N', () => {
    expect(() => computeSeasons({ latitude: 69, longitude: 18, timezone: 'Europe/Oslo', year: 1800 })).toThrow(/year/)
    expect(() => computeSeasons({ latitude: 69, longitude: 18, timezone: 'Europe/Oslo', year: 2026, minCivilHours: 25 })).toThrow(/minCivilHours/)
  })
})

describe('next transitions', () => {
  const site = { latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' }

  it('agree with the season spans when looking ahead from October', () => {
    const next = findNextTransitions({ ...site, today: '2026-10-01' })
    const y2026 = computeSeasons({ ...site, year: 2026 })
    const y2027 = computeSeasons({ ...site, year: 2027 })
    expect(next.status).toBe('rises-and-sets')
    expect(next.polarNightBegins).toBe(y2026.polarNight[y2026.polarNight.length - 1]!.from)
    expect(next.polarNightEnds).toBe(shiftLocalDate(y2027.polarNight[0]!.to, 1))
    expect(next.midnightSunBegins).toBe(y2027.midnightSun[0]!.from)
    expect(next.midnightSunEnds).toBe(shiftLocalDate(y2027.midnightSun[0]!.to, 1))
    expect(next.civilLightFallsBelow).toBe(shiftLocalDate(y2026.lastDayWithCivilHours!, 1))
    expect(next.civilLightReaches).toBe(y2027.firstDayWithCivilHours)
  })

  it('report the state of today and the next changes from inside polar night', () => {
    const next = findNextTransitions({ ...site, today: '2026-12-01' })
    expect(next.status).toBe('polar-night')
    expect(next.civilLightMinutes).toBe(0)
    expect(next.polarNightEnds! < '2027-03-01').toBe(true)
    expect(next.polarNightBegins! > '2027-10-01').toBe(true)
  })

  it('find nothing to report on the equator', () => {
    const next = findNextTransitions({ latitude: 0, longitude: 0, timezone: 'UTC', today: '2026-05-01' })
    expect(next).toMatchObject({ polarNightBegins: null, polarNightEnds: null, midnightSunBegins: null, midnightSunEnds: null, civilLightFallsBelow: null, civilLightReaches: null })
  })
})
