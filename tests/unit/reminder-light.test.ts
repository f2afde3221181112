// The light window that the crew home and the evening-before reminder print, against an outside
// reference: astronomy-engine 2.1.19. Sunrise and sunset from its SearchRiseSet (upper limb on the
// horizon with standard refraction, the USNO convention); civil dawn and dusk from its SearchAltitude
// at −6° (geometric, centre of the disc). Times are printed to the minute, so each must be within
// 2 minutes of the reference.
import { Body, Observer, SearchAltitude, SearchRiseSet } from 'astronomy-engine'
import { fromZonedTime } from 'date-fns-tz'
import { describe, expect, it } from 'vitest'
import { describeMinutesChange, describeLightRows, summariseCrewLightDays } from '../../server/services/crew-day'
import { localMidnightMs } from '../../server/core/time/zoned'

const MINUTE_MS = 60_000
const TOLERANCE_MS = 2 * MINUTE_MS

interface Place { name: string, latitude: number, longitude: number, timezone: string }

// invented sites at real coordinates (demo scenario), each on a date with a sunrise and a sunset
const CASES: { place: Place, date: string }[] = [
  { place: { name: 'Ravnvik', latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }, date: '2027-03-10' },
  { place: { name: 'Larsen Wharf', latitude: 60.3913, longitude: 5.3221, timezone: 'Europe/Oslo' }, date: '2026-12-14' },
  { place: { name: 'Tamarack Creek', latitude: 62.454, longitude: -135.357, timezone: 'America/Whitehorse' }, date: '2027-03-20' },
  { place: { name: 'Saqqaq Ridge', latitude: 69.2198, longitude: -51.0986, timezone: 'America/Nuuk' }, date: '2027-10-31' },
  { place: { name: 'Cape Mawdsley', latitude: -77.846, longitude: 166.676, timezone: 'Antarctica/McMurdo' }, date: '2027-04-10' }
]

function reference(place: Place, date: string) {
  const observer = new Observer(place.latitude, place.longitude, 0)
  const start = new Date(localMidnightMs(date, place.timezone))
  const ms = (t: { date: Date } | null) => t?.date.getTime() ?? NaN
  return {
    sunrise: ms(SearchRiseSet(Body.Sun, observer, +1, start, 1)),
    sunset: ms(SearchRiseSet(Body.Sun, observer, -1, start, 1)),
    civilDawn: ms(SearchAltitude(Body.Sun, observer, +1, start, 1, -6)),
    civilDusk: ms(SearchAltitude(Body.Sun, observer, -1, start, 1, -6))
  }
}

// The printed wall-clock minute, read back as an instant in the zone it is printed in.
function printedInstant(date: string, hhmm: string, timezone: string): number {
  return fromZonedTime(`${date}T${hhmm}:00`, timezone).getTime()
}

describe('the light window a reminder prints, against astronomy-engine', () => {
  for (const { place, date } of CASES) {
    it(`prints sunrise, sunset, civil dawn and dusk within 2 min at ${place.name} on ${date}`, () => {
      const [day] = summariseCrewLightDays(place, date, date, place.timezone)
      const ref = reference(place, date)
      expect(day!.status).toBe('rises-and-sets')
      const pairs: [string, number][] = [
        [day!.sunrise[0]!.time, ref.sunrise], [day!.sunset[0]!.time, ref.sunset],
        [day!.civilDawn[0]!.time, ref.civilDawn], [day!.civilDusk[0]!.time, ref.civilDusk]
      ]
      for (const [printed, expected] of pairs) {
        expect(Number.isFinite(expected)).toBe(true)
        expect(Math.abs(printedInstant(date, printed, place.timezone) - expected)).toBeLessThanOrEqual(TOLERANCE_MS)
      }
      // daylight = sunset − sunrise on a day with one of each (astronomy-engine), to 2 min
      expect(Math.abs(day!.daylightMinutes - (ref.sunset - ref.sunrise) / MINUTE_MS)).toBeLessThanOrEqual(2)
    })
  }

  it('prints the change in daylight from the day before as the reference has it (Ravnvik, 10 Mar 2027)', () => {
    const place = CASES[0]!.place
    const [day] = summariseCrewLightDays(place, '2027-03-10', '2027-03-10', place.timezone)
    const today = reference(place, '2027-03-10')
    const before = reference(place, '2027-03-09')
    const expected = ((today.sunset - today.sunrise) - (before.sunset - before.sunrise)) / MINUTE_MS
    // near the equinox at 69.6° N daylight grows by roughly 8–9 minutes a day (astronomy-engine here)
    expect(expected).toBeGreaterThan(7)
    expect(Math.abs(day!.daylightChange - expected)).toBeLessThanOrEqual(2)
    expect(day!.daylightChangeText).toBe(`+${day!.daylightChange} min since the day before`)
  })

  it('says polar night with no sunrise where astronomy-engine finds none within the local day (Kvitfjell, 78.2° N, 14 Dec)', () => {
    const place = { name: 'Kvitfjell', latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen' }
    const [day] = summariseCrewLightDays(place, '2026-12-14', '2026-12-14', place.timezone)
    const ref = reference(place, '2026-12-14')
    expect(Number.isNaN(ref.sunrise) || ref.sunrise >= localMidnightMs('2026-12-15', place.timezone)).toBe(true)
    expect(day!.status).toBe('polar-night')
    expect(day!.sunrise).toEqual([])
    expect(day!.statusWords).toMatch(/^Polar night/)
    const rows = describeLightRows(day!)
    expect(rows.find(r => r.key === 'sunrise')!.value).toBe('none: polar night')
    // at 78° N in mid-December the noon sun stays below −6° too (docs/references.md: civil polar night from 72°34′)
    expect(rows.find(r => r.key === 'civil-dawn')!.value).toBe('none: no civil light')
  })

  it('says midnight sun with no sunset where astronomy-engine finds none (Kvitfjell, 21 Jun 2027)', () => {
    const place = { name: 'Kvitfjell', latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen' }
    const [day] = summariseCrewLightDays(place, '2027-06-21', '2027-06-21', place.timezone)
    const ref = reference(place, '2027-06-21')
    expect(Number.isNaN(ref.sunset) || ref.sunset >= localMidnightMs('2027-06-22', place.timezone)).toBe(true)
    expect(day!.status).toBe('midnight-sun')
    expect(day!.daylightMinutes).toBe(24 * 60)
    expect(describeLightRows(day!).find(r => r.key === 'sunset')!.value).toBe('none: the sun is up all day')
  })

  it('writes the times in the zone the person chose, with its offset beside each', () => {
    const place = CASES[1]!.place
    const [site] = summariseCrewLightDays(place, '2026-12-14', '2026-12-14', place.timezone)
    const [own] = summariseCrewLightDays(place, '2026-12-14', '2026-12-14', 'America/Nuuk')
    expect(site!.sunrise[0]!.offset).toBe('UTC+01:00')
    expect(own!.sunrise[0]!.offset).toBe('UTC−02:00')
    // the same instant, three hours apart on the wall clock (Oslo UTC+1, Nuuk UTC−2 in December, tz data)
    expect(Date.parse(site!.sunrise[0]!.at)).toBe(Date.parse(own!.sunrise[0]!.at))
  })
})

describe('change wording', () => {
  it('writes a loss with a true minus sign and durations as h and min (docs/look.md)', () => {
    expect(describeMinutesChange(-27, 'yesterday')).toBe('−27 min since yesterday')
    expect(describeMinutesChange(64, 'yesterday')).toBe('+1 h 4 min since yesterday')
    expect(describeMinutesChange(0, 'yesterday')).toBe('same as yesterday')
  })
})
