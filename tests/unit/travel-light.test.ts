// The light check and the slot finder over a whole outing (leave = start − travel, back = end + travel),
// at several travel lengths, at dawn and at dusk.
// Reference: astronomy-engine 2.1.19 (npm), SearchAltitude on the geometric (unrefracted) altitude of
// the sun's centre: sunrise/sunset at −0.833°, civil dawn/dusk at −6° (USNO conventions, docs/light-model.md).
// The light engine's crossings were measured within 0.017° of the reference (docs/references.md), about
// 15 s of time at this site and season: the tolerance below is one minute.
// Site: 69.6496° N 18.956° E (an invented yard on the coast of Troms), Europe/Oslo, 20 Feb 2027.
import { Body, MakeTime, Observer, SearchAltitude } from 'astronomy-engine'
import { describe, expect, it } from 'vitest'
import { checkShiftLight, computeOutingWindow } from '../../server/core/light/check'
import { computeLightDaysMs } from '../../server/core/light/index'
import { listValidSlotStarts, type SlotSearchInput } from '../../server/core/planning/slot-finder'
import { nextDate, referenceMidnight } from '../support/outlook-reference'

const PLACE = { latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }
const DATE = '2027-02-20'
const MIN = 60_000
const TOLERANCE_MIN = 1
const TRAVEL_LENGTHS = [0, 45, 90, 150]

function referenceCrossing(altitude: number, direction: 1 | -1): number {
  const observer = new Observer(PLACE.latitude, PLACE.longitude, 0)
  const found = SearchAltitude(Body.Sun, observer, direction, MakeTime(new Date(referenceMidnight(DATE, PLACE.timezone))), 1, altitude)
  if (!found) throw new Error(`no crossing of ${altitude}° on ${DATE}`)
  return found.date.getTime()
}

const SUNRISE = referenceCrossing(-0.833, 1)
const SUNSET = referenceCrossing(-0.833, -1)
const CIVIL_DAWN = referenceCrossing(-6, 1)
const CIVIL_DUSK = referenceCrossing(-6, -1)

function check(startMs: number, endMs: number, travelMinutes: number, requirement: 'daylight' | 'civil' = 'daylight') {
  return checkShiftLight({ ...PLACE, startMs, endMs, requirement, travelMinutes })
}

describe('the light check covers the outing, start − travel to end + travel', () => {
  it('reports the checked window as the outing', () => {
    const start = SUNRISE + 3 * 60 * MIN
    const result = check(start, start + 2 * 60 * MIN, 90)
    expect(result.checkedFromMs).toBe(start - 90 * MIN)
    expect(result.checkedToMs).toBe(start + 2 * 60 * MIN + 90 * MIN)
    expect(computeOutingWindow(start, start + MIN, 0)).toEqual({ fromMs: start, toMs: start + MIN })
  })

  for (const travel of TRAVEL_LENGTHS) {
    it(`passes a daylight task whose ${travel}-minute trips lie just inside sunrise and sunset`, () => {
      const result = check(SUNRISE + (travel + 2) * MIN, SUNSET - (travel + 2) * MIN, travel)
      expect(result.minutesBelow).toBe(0)
      expect(result.flagged).toBe(false)
    })

    it(`counts the dark minutes of a ${travel}-minute trip out that leaves 20 minutes before sunrise`, () => {
      // on site from sunrise + travel − 20 min: the trip out starts 20 minutes before the reference sunrise
      const start = SUNRISE + (travel - 20) * MIN
      const result = check(start, start + 60 * MIN, travel)
      expect(Math.abs(result.minutesBelow - 20)).toBeLessThanOrEqual(TOLERANCE_MIN)
      expect(result.flagged).toBe(true)
    })

    it(`counts the dark minutes of a ${travel}-minute trip back that ends 35 minutes after sunset`, () => {
      const end = SUNSET - travel * MIN + 35 * MIN
      const result = check(end - 60 * MIN, end, travel)
      expect(Math.abs(result.minutesBelow - 35)).toBeLessThanOrEqual(TOLERANCE_MIN)
    })

    it(`holds a civil-light task to civil dawn and dusk with ${travel} minutes of travel`, () => {
      const inside = check(CIVIL_DAWN + (travel + 2) * MIN, CIVIL_DUSK - (travel + 2) * MIN, travel, 'civil')
      expect(inside.minutesBelow).toBe(0)
      const early = check(CIVIL_DAWN + (travel - 12) * MIN, CIVIL_DAWN + (travel + 60) * MIN, travel, 'civil')
      expect(Math.abs(early.minutesBelow - 12)).toBeLessThanOrEqual(TOLERANCE_MIN)
    })
  }
})

describe('the slot finder proposes time on site whose whole outing is in the light', () => {
  const days = computeLightDaysMs({ ...PLACE, from: nextDate(DATE, -1), to: nextDate(DATE, 1) })
  const input = (travelMinutes: number): SlotSearchInput => ({
    days, from: DATE, to: DATE, durationMinutes: 120, requirement: 'daylight',
    people: [{ id: 1, name: 'Ada Test' }], context: { otherShifts: [], unavailable: [], personNames: {} },
    rules: { minRestHours: 11, maxShiftHours: 12 }, rank: 'earliest', travelMinutes
  })

  for (const travel of TRAVEL_LENGTHS) {
    it(`with ${travel} minutes each way, the first slot leaves after sunrise and the last is back before sunset`, () => {
      const valid = listValidSlotStarts(input(travel)).scans.get(DATE)!.valid
      expect(valid.length).toBeGreaterThan(0)
      const first = valid[0]!
      const last = valid[valid.length - 1]!
      // the first quarter hour at which the party can leave in daylight
      expect(first.startMs - travel * MIN).toBeGreaterThanOrEqual(SUNRISE - TOLERANCE_MIN * MIN)
      expect(first.startMs - travel * MIN).toBeLessThan(SUNRISE + (15 + TOLERANCE_MIN) * MIN)
      // the last quarter hour from which the party is back by sunset
      expect(last.endMs + travel * MIN).toBeLessThanOrEqual(SUNSET + TOLERANCE_MIN * MIN)
      expect(last.endMs + travel * MIN).toBeGreaterThan(SUNSET - (15 + TOLERANCE_MIN) * MIN)
      for (const slot of valid) expect(check(slot.startMs, slot.endMs, travel).minutesBelow).toBe(0)
    })
  }

  it('finds nothing when the trips alone outlast the day', () => {
    const daylight = Math.floor((SUNSET - SUNRISE) / MIN)
    const travel = Math.ceil((daylight - 120) / 2) + 5
    expect(listValidSlotStarts(input(travel)).scans.get(DATE)!.valid).toEqual([])
  })
})
