import { Body, Equator, Horizon, MakeTime, Observer, SearchAltitude, Seasons } from 'astronomy-engine'
import { describe, expect, it } from 'vitest'
import { computeLightDaysMs } from '../../server/core/light/index'
import { computeYearChart } from '../../server/core/light/year-chart'
import { toWallMinute } from '../../shared/outlook'
import { daysApart, referenceMidnight } from '../support/outlook-reference'

const KVITFJELL = { siteId: 1, latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen' }
const TAMARACK = { siteId: 2, latitude: 62.454, longitude: -135.357, timezone: 'America/Whitehorse' }
const RAVNVIK = { siteId: 3, latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }
const MIN = 60_000

describe('year chart data equals the light engine\'s periods', () => {
  const chart = computeYearChart({ ...KVITFJELL, year: 2027 })
  const engine = computeLightDaysMs({ ...KVITFJELL, from: '2027-01-01', to: '2027-12-31' })

  it('has every local day of the year, with the engine\'s figures', () => {
    expect(chart.days.map(d => d.date)).toEqual(engine.map(d => d.date))
    expect(chart.days).toHaveLength(365)
    chart.days.forEach((day, i) => {
      const e = engine[i]!
      expect(day.daylightMinutes).toBe(e.daylightMinutes)
      expect(day.civilLightMinutes).toBe(e.civilLightMinutes)
      expect(day.status).toBe(e.status)
      expect(day.minutes).toBe(Math.round((e.endMs - e.startMs) / MIN))
    })
  })

  it('gives each day the engine\'s bands to the minute, as a partition of the local day', () => {
    chart.days.forEach((day, i) => {
      const e = engine[i]!
      expect(day.periods[0]![1]).toBe(0)
      expect(day.periods[day.periods.length - 1]![2]).toBe(day.minutes)
      for (let k = 1; k < day.periods.length; k++) {
        expect(day.periods[k]![1]).toBe(day.periods[k - 1]![2])
        expect(day.periods[k]![0]).not.toBe(day.periods[k - 1]![0])
      }
      // every engine band of a minute or more appears with its rounded edges
      const long = e.periods.filter(p => p.endMs - p.startMs >= MIN)
      if (long.length === e.periods.length) {
        expect(day.periods).toEqual(e.periods.map(p => [p.kind, Math.round((p.startMs - e.startMs) / MIN), Math.round((p.endMs - e.startMs) / MIN)]))
      }
      // and at every minute's middle the chart and the engine name the same band
      for (let m = 0; m < day.minutes; m += 7) {
        const ms = e.startMs + (m + 0.5) * MIN
        const engineKind = e.periods.find(p => p.startMs <= ms && ms < p.endMs)!.kind
        const chartKind = day.periods.find(p => p[1] <= m + 0.5 && m + 0.5 < p[2])!
        const nearEdge = e.periods.some(p => Math.abs(p.startMs - ms) < MIN)
        if (!nearEdge) expect(chartKind[0]).toBe(engineKind)
      }
    })
  })

  it('covers the polar night and the midnight sun at 78° N', () => {
    expect(chart.days.filter(d => d.status === 'polar-night').length).toBeGreaterThan(90)
    expect(chart.days.filter(d => d.status === 'midnight-sun').length).toBeGreaterThan(110)
    const polar = chart.days.find(d => d.date === '2027-12-21')!
    expect(polar.sunriseAzimuth).toBeNull()
    expect(polar.periods.some(p => p[0] === 'day')).toBe(false)
  })
})

describe('clock changes', () => {
  // EU summer time (Directive 2000/84/EC, arts. 2–3): from 01:00 UTC on the last Sunday of March to
  // 01:00 UTC on the last Sunday of October; Svalbard keeps Norway's (CET/CEST) rules in the tz data.
  it('finds both changes of 2027 in Arctic/Longyearbyen, to the minute', () => {
    const { clockChanges } = computeYearChart({ ...KVITFJELL, year: 2027 })
    expect(clockChanges).toEqual([
      { date: '2027-03-28', atMinute: 120, fromOffset: '+01:00', toOffset: '+02:00', shiftMinutes: 60 },
      { date: '2027-10-31', atMinute: 180, fromOffset: '+02:00', toOffset: '+01:00', shiftMinutes: -60 }
    ])
    const spring = computeYearChart({ ...KVITFJELL, year: 2027 }).days.find(d => d.date === '2027-03-28')!
    expect(spring.minutes).toBe(23 * 60)
    // after the change the wall clock runs an hour ahead of the minutes elapsed since midnight
    expect(toWallMinute(spring.minutes, clockChanges[0])).toBe(24 * 60)
  })

  // Outside reference for the offsets: the IANA tz data as Node's Intl reads it ('longOffset' names).
  const intlOffset = (ms: number, timeZone: string) => {
    const name = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' }).formatToParts(ms).find(p => p.type === 'timeZoneName')!.value
    return name === 'GMT' ? '+00:00' : name.slice(3)
  }
  for (const place of [
    { latitude: 64.18, longitude: -51.72, timezone: 'America/Nuuk', shifts: [60, -60] },
    // the station zone with a two-hour summer shift (+00 to +02)
    { latitude: -72.01, longitude: 2.53, timezone: 'Antarctica/Troll', shifts: [120, -120] }
  ]) {
    it(`places the changes of ${place.timezone} where the tz data has them, with a ${place.shifts[0]}-minute jump`, () => {
      const { clockChanges, days } = computeYearChart({ siteId: 9, ...place, year: 2027 })
      expect(clockChanges.map(c => c.shiftMinutes)).toEqual(place.shifts)
      for (const c of clockChanges) {
        const at = referenceMidnight(c.date, place.timezone) + c.atMinute * MIN
        expect(intlOffset(at - 1000, place.timezone)).toBe(c.fromOffset)
        expect(intlOffset(at, place.timezone)).toBe(c.toOffset)
        expect(days.find(d => d.date === c.date)!.minutes).toBe(1440 - c.shiftMinutes)
      }
    })
  }

  it('finds none in a zone without daylight saving (America/Whitehorse: fixed UTC−7 since 2020 in the tz data, from memory)', () => {
    expect(computeYearChart({ ...TAMARACK, year: 2027 }).clockChanges).toEqual([])
  })
})

describe('solstices, equinoxes and sunrise bearings against astronomy-engine', () => {
  it('marks the solstices and equinoxes on the reference\'s local dates (astronomy-engine Seasons)', () => {
    const chart = computeYearChart({ ...KVITFJELL, year: 2027 })
    const ref = Seasons(2027)
    const local = (d: Date) => new Intl.DateTimeFormat('en-CA', { timeZone: KVITFJELL.timezone }).format(d)
    const expected = [ref.mar_equinox.date, ref.jun_solstice.date, ref.sep_equinox.date, ref.dec_solstice.date].map(local)
    chart.markers.forEach((m, i) => expect(daysApart(m.date, expected[i]!)).toBe(0))
    expect(chart.markers.map(m => m.kind)).toEqual(['march-equinox', 'june-solstice', 'september-equinox', 'december-solstice'])
  })

  it('gives each day\'s sunrise azimuth within 0.5° of the reference sunrise (centre at −0.833°, astronomy-engine SearchAltitude)', () => {
    const chart = computeYearChart({ ...RAVNVIK, year: 2027 })
    const observer = new Observer(RAVNVIK.latitude, RAVNVIK.longitude, 0)
    const checked = chart.days.filter((_, i) => i % 29 === 0 && chart.days[i]!.sunriseAzimuth !== null)
    expect(checked.length).toBeGreaterThan(6)
    for (const day of checked) {
      const rise = SearchAltitude(Body.Sun, observer, +1, new Date(referenceMidnight(day.date, RAVNVIK.timezone)), 1, -0.833)!
      const eq = Equator(Body.Sun, rise, observer, true, true)
      const azimuth = Horizon(MakeTime(rise.date), observer, eq.ra, eq.dec).azimuth
      expect(Math.abs(day.sunriseAzimuth! - azimuth), day.date).toBeLessThan(0.5)
    }
  })

  it('at 62° N puts the northernmost sunrise at the June solstice and the southernmost at the December one (within 3 days)', () => {
    const chart = computeYearChart({ ...TAMARACK, year: 2027 })
    const ref = Seasons(2027)
    const local = (d: Date) => new Intl.DateTimeFormat('en-CA', { timeZone: TAMARACK.timezone }).format(d)
    expect(daysApart(chart.horizon.northernmostSunrise!.date, local(ref.jun_solstice.date))).toBeLessThanOrEqual(3)
    expect(daysApart(chart.horizon.southernmostSunrise!.date, local(ref.dec_solstice.date))).toBeLessThanOrEqual(3)
    expect(daysApart(chart.horizon.northernmostSunset!.date, local(ref.jun_solstice.date))).toBeLessThanOrEqual(3)
    expect(chart.horizon.northernmostSunrise!.azimuth).toBeLessThan(chart.horizon.southernmostSunrise!.azimuth)
  })
})
