// Each review reason at its boundary, against an outside reference where one exists:
// astronomy-engine 2.1.19 for the sun (civil dusk as the sun's centre crossing −6°, unrefracted),
// the ECCC wind chill chart for the cold limit, the work rules' own figure for the longest shift.
import { describe, expect, it } from 'vitest'
import { Body, MakeTime, Observer, SearchAltitude } from 'astronomy-engine'
import { computeReviewReasons, countMinutesBelowCivil, type ReviewReasonInput } from '../../server/core/review/reasons'
import { summariseColdForWindow } from '../../server/core/review/queue'
import { computeLightPeriodsInRange } from '../../server/core/light/index'
import { describeReviewReason } from '../../shared/review'
import { referenceAltitude } from '../support/sun-reference'

const MIN = 60_000
const HOUR = 3_600_000
// An invented coastal site at 69.65° N, 18.96° E; times are UTC instants.
const NORTH = { latitude: 69.65, longitude: 18.96 }
// An invented site at 78.22° N, 15.65° E, deep in polar night in mid-December.
const POLAR = { latitude: 78.22, longitude: 15.65 }
const RULES = { maxShiftHours: 12, reviewWindChillC: -27 }

function input(overrides: Partial<ReviewReasonInput> & { fromMs: number, toMs: number }): ReviewReasonInput {
  const { fromMs, toMs, ...rest } = overrides
  return {
    ...NORTH,
    window: { fromMs, toMs },
    shiftStartMs: fromMs,
    shiftEndMs: toMs,
    lightCheck: { flagged: false, minutesBelow: 0, requirement: 'any' },
    assigneeCount: 1,
    cold: null,
    rules: RULES,
    ...rest
  }
}

/** Civil dusk from astronomy-engine: the sun's centre setting through −6° (geometric, no refraction). */
function referenceCivilDusk(latitude: number, longitude: number, fromIso: string): number {
  const found = SearchAltitude(Body.Sun, new Observer(latitude, longitude, 0), -1, MakeTime(new Date(fromIso)), 1, -6)
  if (!found) throw new Error('no civil dusk found')
  return found.date.getTime()
}

describe('lone: one person and any minute with the sun below −6°', () => {
  const dusk = referenceCivilDusk(NORTH.latitude, NORTH.longitude, '2027-02-20T06:00:00Z')

  it('flags a lone worker whose shift runs one minute past civil dusk (astronomy-engine)', () => {
    const reasons = computeReviewReasons(input({ fromMs: dusk - 3 * HOUR, toMs: dusk + MIN }))
    expect(reasons.map(r => r.reason)).toEqual(['lone'])
    expect(reasons[0]).toEqual({ reason: 'lone', minutesDark: 1 })
  })

  it('leaves a lone worker alone who stops one minute before civil dusk (astronomy-engine)', () => {
    expect(computeReviewReasons(input({ fromMs: dusk - 3 * HOUR, toMs: dusk - MIN }))).toEqual([])
  })

  it('does not call two people past civil dusk lone', () => {
    expect(computeReviewReasons(input({ fromMs: dusk - 3 * HOUR, toMs: dusk + 30 * MIN, assigneeCount: 2 }))).toEqual([])
  })

  it('flags a lone worker in a lit work area in polar night, every minute dark (astronomy-engine)', () => {
    const from = Date.parse('2026-12-15T09:00:00Z')
    const to = Date.parse('2026-12-15T13:00:00Z')
    // the reference sun stays below −6° through the whole window: polar night darker than civil twilight
    for (let t = from; t <= to; t += 15 * MIN) expect(referenceAltitude(t, POLAR.latitude, POLAR.longitude)).toBeLessThan(-6)
    const reasons = computeReviewReasons(input({ ...POLAR, fromMs: from, toMs: to, lightCheck: { flagged: false, minutesBelow: 0, requirement: 'any' } }))
    expect(reasons).toEqual([{ reason: 'lone', minutesDark: 240 }])
    expect(describeReviewReason(reasons[0]!)).toBe('Alone in the dark: one person, 4 h with the sun below −6°')
  })

  it('counts the whole window given, so travel before the shift is covered', () => {
    const shiftStart = dusk + HOUR
    const dark = countMinutesBelowCivil(NORTH.latitude, NORTH.longitude, { fromMs: dusk - HOUR, toMs: shiftStart + HOUR })
    expect(dark).toBe(120)
  })
})

describe('cold: wind chill at or below the operator limit, or a stop-work cell', () => {
  const from = Date.parse('2027-01-10T10:00:00Z')
  const to = from + 4 * HOUR
  function coldAt(temperatureC: number, windKmh: number) {
    const bands = computeLightPeriodsInRange(NORTH.latitude, NORTH.longitude, from, to)
    const samples = [0, 1, 2, 3, 4].map(h => ({ atMs: from + h * HOUR, temperatureC, windKmh, gustKmh: null }))
    return summariseColdForWindow(samples, bands, 'Europe/Oslo')
  }

  // ECCC wind chill chart: −20 °C with 10 km/h reads −27 (memory; the 2001 formula gives −27.2).
  it('flags a forecast whose wind chill reads exactly the limit on the ECCC chart (−20 °C, 10 km/h → −27)', () => {
    const reasons = computeReviewReasons(input({ fromMs: from, toMs: to, assigneeCount: 3, cold: coldAt(-20, 10) }))
    expect(reasons.map(r => r.reason)).toEqual(['cold'])
    expect(reasons[0]).toMatchObject({ reason: 'cold', windChillC: -27, limitC: -27 })
  })

  // ECCC wind chill chart: −15 °C with 15 km/h reads −23 (memory; the formula gives −23.1).
  it('does not flag one degree warmer than the limit (ECCC chart −15 °C, 15 km/h → −23, limit −24)', () => {
    const reasons = computeReviewReasons(input({ fromMs: from, toMs: to, assigneeCount: 3, cold: coldAt(-15, 15), rules: { ...RULES, reviewWindChillC: -24 } }))
    expect(reasons).toEqual([])
  })

  it('flags the same chart cell once the limit is at its value (−23)', () => {
    const reasons = computeReviewReasons(input({ fromMs: from, toMs: to, assigneeCount: 3, cold: coldAt(-15, 15), rules: { ...RULES, reviewWindChillC: -23 } }))
    expect(reasons.map(r => r.reason)).toEqual(['cold'])
  })

  // ACGIH TLV work/warm-up schedule (as printed in the ACGIH TLV booklet; memory): at −43 °C and
  // colder, in any wind, non-emergency work should cease. Here above the wind chill limit on purpose.
  it('flags a stop-work cell of the warm-up schedule even with a lenient wind chill limit', () => {
    const reasons = computeReviewReasons(input({ fromMs: from, toMs: to, assigneeCount: 3, cold: coldAt(-45, 8), rules: { ...RULES, reviewWindChillC: -80 } }))
    expect(reasons).toHaveLength(1)
    expect(reasons[0]).toMatchObject({ reason: 'cold', stopWork: true })
  })

  it('gives no cold reason when the figures are unknown', () => {
    expect(computeReviewReasons(input({ fromMs: from, toMs: to, assigneeCount: 3, cold: null }))).toEqual([])
  })
})

describe('long: longer than the work rules\' longest shift', () => {
  const from = Date.parse('2027-06-20T06:00:00Z')

  it('does not flag a shift of exactly the maximum (12 h)', () => {
    expect(computeReviewReasons(input({ fromMs: from, toMs: from + 12 * HOUR, assigneeCount: 2 }))).toEqual([])
  })

  it('flags a shift one minute longer than the maximum', () => {
    const reasons = computeReviewReasons(input({ fromMs: from, toMs: from + 12 * HOUR + MIN, assigneeCount: 2 }))
    expect(reasons).toEqual([{ reason: 'long', minutes: 721, maxMinutes: 720 }])
  })

  it('describes a 14 h shift in words with its figure', () => {
    const [reason] = computeReviewReasons(input({ fromMs: from, toMs: from + 14 * HOUR, assigneeCount: 2 }))
    expect(describeReviewReason(reason!)).toBe('Long shift: 14 h, over the 12 h maximum')
  })
})

describe('light: the stored light check', () => {
  it('lists light first, then the others in a fixed order', () => {
    const dusk = referenceCivilDusk(NORTH.latitude, NORTH.longitude, '2027-02-20T06:00:00Z')
    const reasons = computeReviewReasons(input({
      fromMs: dusk - 10 * HOUR, toMs: dusk + 4 * HOUR,
      lightCheck: { flagged: true, minutesBelow: 300, requirement: 'daylight' }
    }))
    expect(reasons.map(r => r.reason)).toEqual(['light', 'lone', 'long'])
    expect(describeReviewReason(reasons[0]!)).toBe('Below its light: 5 h below daylight')
  })
})
