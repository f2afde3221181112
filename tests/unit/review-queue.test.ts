import { describe, expect, it } from 'vitest'
import type { LightPeriodMs } from '../../shared/light'
import {
  buildLightStrip,
  collectReviewCautions,
  compareReviewQueueItems,
  describeReviewCrew,
  isSunUpAt,
  shapeReviewQueueItem,
  sumBandMinutes,
  summariseColdForWindow,
  type ReviewQueueItem,
  type WeatherSample,
  type WindowWeather
} from '../../server/core/review/queue'
import type { ShiftReply } from '../../server/services/shifts'

const MIN = 60_000
const HOUR = 3_600_000
// An invented shift window; the zone is a real IANA zone at UTC+01:00 in December.
const T0 = Date.parse('2026-12-14T08:00:00Z')
const ZONE = 'Europe/Oslo'

function bands(...parts: [LightPeriodMs['kind'], number][]): LightPeriodMs[] {
  let at = T0
  return parts.map(([kind, minutes]) => {
    const band = { kind, startMs: at, endMs: at + minutes * MIN }
    at = band.endMs
    return band
  })
}

function sample(hours: number, temperatureC: number, windKmh: number, gustKmh: number | null = null): WeatherSample {
  return { atMs: T0 + hours * HOUR, temperatureC, windKmh, gustKmh }
}

function fahrenheit(c: number) {
  return c * 9 / 5 + 32
}

const NO_WEATHER: WindowWeather = {
  basis: 'none', label: 'No forecast',
  forecast: { state: 'none', fetchedAt: null, source: null, lastAttempt: null },
  observations: { count: 0, first: null, last: null },
  figures: null
}

function shift(overrides: Partial<ShiftReply> = {}): ShiftReply {
  return {
    id: 1, siteId: 1, siteName: 'Invented site', timezone: ZONE, title: 'Invented task',
    start: '2026-12-14T09:00:00+01:00', end: '2026-12-14T13:00:00+01:00', light: 'daylight', notes: '',
    assigneeIds: [1, 2], assignees: [{ id: 1, name: 'A' }, { id: 2, name: 'B' }],
    travelMinutes: 0,
    lightCheck: { requirement: 'daylight', minutesBelow: 90, flagged: true, checkedFrom: '2026-12-14T09:00:00+01:00', checkedTo: '2026-12-14T13:00:00+01:00' }, reviewState: 'pending',
    reviewReasons: ['light'], reviewReasonDetails: [{ reason: 'light', minutesBelow: 90, requirement: 'daylight' }],
    review: null, conflictOverride: null, conflicts: [], version: 1, cancelled: false, rotationId: null, ...overrides
  }
}

describe('light strip of a shift', () => {
  // Which bands meet which requirement: docs/light-model.md (USNO band conventions).
  it('marks civil twilight as meeting a civil requirement and not a daylight one', () => {
    const b = bands(['nautical', 30], ['civil', 45], ['day', 120])
    expect(buildLightStrip(b, 'civil', ZONE).map(s => s.meetsRequirement)).toEqual([false, true, true])
    expect(buildLightStrip(b, 'daylight', ZONE).map(s => s.meetsRequirement)).toEqual([false, false, true])
    expect(buildLightStrip(b, 'any', ZONE).every(s => s.meetsRequirement)).toBe(true)
  })

  it('writes each segment with its times in the site zone and its whole minutes', () => {
    const [first, second] = buildLightStrip(bands(['civil', 45], ['day', 30]), 'daylight', ZONE)
    expect(first).toEqual({ kind: 'civil', start: '2026-12-14T09:00:00+01:00', end: '2026-12-14T09:45:00+01:00', minutes: 45, meetsRequirement: false })
    expect(second!.start).toBe(first!.end)
  })

  it('adds up minutes per band and leaves out empty segments', () => {
    const b = [...bands(['night', 60], ['astronomical', 30], ['night', 15]), { kind: 'day' as const, startMs: T0, endMs: T0 }]
    expect(sumBandMinutes(b)).toEqual({ day: 0, civil: 0, nautical: 0, astronomical: 30, night: 75 })
    expect(buildLightStrip(b, 'civil', ZONE)).toHaveLength(3)
  })

  it('reads the sun as up only in the day band (sunrise/sunset at −0.833°, USNO)', () => {
    const b = bands(['civil', 60], ['day', 60])
    expect(isSunUpAt(b, T0 + 30 * MIN)).toBe(false)
    expect(isSunUpAt(b, T0 + 90 * MIN)).toBe(true)
    // a forecast hour just after the shift is judged by the shift's last minute
    expect(isSunUpAt(b, T0 + 3 * HOUR)).toBe(true)
    expect(isSunUpAt([], T0)).toBe(false)
  })
})

describe('cold figures over a shift window', () => {
  it('reproduces the NWS wind chill chart: 0 °F with 15 mph → −19 °F, "frostbite in 30 minutes"', () => {
    // NWS Wind Chill Chart (2001 index). Metric inputs: 0 °F = −17.78 °C, 15 mph = 24.14 km/h.
    const figures = summariseColdForWindow([sample(0, -17.7778, 24.1402)], bands(['day', 240]), ZONE)!
    expect(Math.round(fahrenheit(figures.worstWindChill!.exactC))).toBe(-19)
    // ECCC wind chill table: −28 to −39 → exposed skin can freeze in 10–30 minutes.
    expect(figures.frostbite).toMatchObject({ key: 'high', minMinutes: 10, maxMinutes: 30, basis: 'wind-chill' })
  })

  it('reproduces the NWS/OSHA example 40 °F with 35 mph → 28 °F', () => {
    // 40 °F = 4.44 °C, 35 mph = 56.33 km/h (NWS chart; also OSHA's cold stress example).
    const figures = summariseColdForWindow([sample(0, 4.4444, 56.327)], bands(['day', 240]), ZONE)!
    expect(Math.round(fahrenheit(figures.worstWindChill!.exactC))).toBe(28)
  })

  it('finds the coldest, windiest and worst wind chill hours separately', () => {
    const figures = summariseColdForWindow([sample(0, -22, 10, 18), sample(1, -26, 5, 9), sample(2, -20, 40, 62)], bands(['night', 180]), ZONE)!
    expect(figures).toMatchObject({ samples: 3, coldestTemperatureC: -26, strongestWindKmh: 40, strongestGustKmh: 62 })
    // ECCC wind chill chart: −20 °C at 40 km/h → −34 (chart cell from memory; the 2001 formula gives −34.1).
    // The colder −26 °C hour has only 5 km/h of wind (formula −31.1), so the windy hour is the worst.
    expect(figures.worstWindChill).toMatchObject({ roundedC: -34, at: '2026-12-14T11:00:00+01:00' })
  })

  it('bands frostbite on the air temperature when the wind chill index is not defined (wind ≤ 4.8 km/h)', () => {
    const figures = summariseColdForWindow([sample(0, -42, 3)], bands(['night', 60]), ZONE)!
    expect(figures.worstWindChill).toBeNull()
    // ECCC bands: −40 to −47 → 5–10 minutes
    expect(figures.frostbite).toMatchObject({ key: 'very-high', basis: 'air-temperature' })
  })

  it('reads the warm-up schedule at the most restrictive hour (ACGIH 4-hour schedule)', () => {
    // −30 °C still: normal breaks; −27 °C at 30 km/h (32 km/h column): 40 min / 4 breaks.
    const limited = summariseColdForWindow([sample(0, -30, 0), sample(1, -27, 30)], bands(['night', 120]), ZONE)!
    expect(limited.warmup).toMatchObject({ kind: 'limited', maxWorkMinutes: 40, breaks: 4, stopWork: false, temperatureC: -27 })
    // light work: one row colder (−29 to −31, 32 km/h) → 30 min / 5 breaks
    expect(limited.warmupLightWork).toMatchObject({ maxWorkMinutes: 30, breaks: 5, stopWork: false })
    // −35 °C at 20 km/h (24 km/h column): non-emergency work should cease
    const stop = summariseColdForWindow([sample(0, -27, 30), sample(1, -35, 20)], bands(['night', 120]), ZONE)!
    expect(stop.warmup).toMatchObject({ kind: 'stop', stopWork: true, temperatureC: -35, at: '2026-12-14T10:00:00+01:00' })
  })

  it('says whether the sun was up at the hour the schedule was read for', () => {
    const figures = summariseColdForWindow([sample(0, -33, 10), sample(1, -20, 5)], bands(['day', 60], ['civil', 60]), ZONE)!
    expect(figures.warmup).toMatchObject({ sunUp: true, sunCaution: false })
    const dark = summariseColdForWindow([sample(1.5, -33, 10)], bands(['day', 60], ['civil', 60]), ZONE)!
    expect(dark.warmup).toMatchObject({ sunUp: false, sunCaution: true })
  })

  it('gives no figures without samples', () => {
    expect(summariseColdForWindow([], bands(['night', 60]), ZONE)).toBeNull()
  })
})

function weatherWith(samples: WeatherSample[], b: LightPeriodMs[]): WindowWeather {
  return { ...NO_WEATHER, basis: 'forecast', label: 'Forecast fetched', forecast: { ...NO_WEATHER.forecast, state: 'fresh' }, figures: summariseColdForWindow(samples, b, ZONE) }
}

describe('cautions for a queue item', () => {
  const dark = bands(['nautical', 60], ['civil', 30], ['day', 150])
  const darkMinutes = sumBandMinutes(dark)

  it('calls out one person alone, and nobody assigned', () => {
    const alone = collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew: describeReviewCrew([{ id: 3, name: 'Invented Person' }]), weather: NO_WEATHER, timezone: ZONE })
    expect(alone.find(c => c.key === 'working-alone')).toMatchObject({ figure: 'Invented Person', general: false })
    const nobody = collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew: describeReviewCrew([]), weather: NO_WEATHER, timezone: ZONE })
    expect(nobody.map(c => c.key)).toContain('nobody-assigned')
    expect(nobody.map(c => c.key)).not.toContain('working-alone')
  })

  it('says how long the shift is below its light and how much of that is nautical twilight or darker', () => {
    const cautions = collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew: describeReviewCrew([{ id: 1, name: 'A' }, { id: 2, name: 'B' }]), weather: NO_WEATHER, timezone: ZONE })
    expect(cautions.find(c => c.key === 'below-light')).toMatchObject({ title: '1 h 30 min below the light this task needs (daylight)', figure: '1 h in nautical twilight or darker' })
    expect(cautions.map(c => c.key)).toContain('no-forecast')
    // with the cold unknown, the general cold guidance is shown, marked general
    expect(cautions.filter(c => c.general).map(c => c.key)).toEqual(['exposed-skin-only', 'frostbite-signs', 'hypothermia-signs', 'wet-clothing', 'warm-shelter'])
  })

  it('puts a stop-work hour first, in the stop tone, with the figure that raised it', () => {
    const night = bands(['night', 240])
    const weather = weatherWith([sample(0, -20, 10), sample(2, -41, 6)], night)
    const cautions = collectReviewCautions({ minutesBelow: 240, requirement: 'civil', bandMinutes: sumBandMinutes(night), crew: describeReviewCrew([{ id: 1, name: 'A' }, { id: 2, name: 'B' }]), weather, timezone: ZONE })
    // ACGIH: −40 to −42 °C with wind up to 8 km/h → stop
    expect(cautions[0]).toMatchObject({ key: 'stop-work', tone: 'stop', figure: '−41 °C, wind 6 km/h at 11:00 UTC+01:00' })
    expect(cautions.filter(c => c.tone === 'stop')).toHaveLength(1)
    // sun down at that hour: the schedule assumes sunshine
    expect(cautions.map(c => c.key)).toContain('sunshine-assumed')
    expect(cautions.map(c => c.key)).toContain('frostbite-time')
  })

  it('leaves out the general cold guidance when the whole window is warmer than 10 °C (wind chill limit)', () => {
    const weather = weatherWith([sample(0, 12, 10)], dark)
    const cautions = collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew: describeReviewCrew([{ id: 1, name: 'A' }, { id: 2, name: 'B' }]), weather, timezone: ZONE })
    expect(cautions.some(c => c.general)).toBe(false)
    expect(cautions.map(c => c.key)).toEqual(['below-light'])
  })

  it('marks figures from a stale forecast and from site readings', () => {
    const stale: WindowWeather = { ...weatherWith([sample(0, -10, 10)], dark), forecast: { ...NO_WEATHER.forecast, state: 'stale' }, label: 'Forecast stale, fetched at Mon 14 Dec 01:00 UTC+01:00' }
    const crew = describeReviewCrew([{ id: 1, name: 'A' }, { id: 2, name: 'B' }])
    expect(collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew, weather: stale, timezone: ZONE }).find(c => c.key === 'forecast-stale')?.figure).toContain('fetched at')
    const readings: WindowWeather = { ...stale, basis: 'observations' }
    expect(collectReviewCautions({ minutesBelow: 90, requirement: 'daylight', bandMinutes: darkMinutes, crew, weather: readings, timezone: ZONE }).map(c => c.key)).toContain('observations-only')
  })
})

describe('queue items', () => {
  it('carries the shift\'s work-rule warnings into its cautions', () => {
    const conflicts = [{ kind: 'rest' as const, personId: 1, personName: 'A', otherShiftId: 9, message: 'A has 6 h rest before this shift.' }]
    const item = shapeReviewQueueItem(shift({ conflicts }), { minutesBelow: 60, bands: bands(['night', 60]) }, NO_WEATHER)
    expect(item.cautions.find(c => c.key === 'work-rules')).toMatchObject({ title: '1 work-rule warning on this shift', figure: 'A has 6 h rest before this shift.' })
  })

  it('marks a shift changed after an earlier decision', () => {
    const b = bands(['civil', 60], ['day', 180])
    const review = { decision: 'approved' as const, mitigations: ['portable-lighting'], note: '', reviewerName: 'R', at: '2026-12-10T10:00:00.000Z', current: false }
    const item = shapeReviewQueueItem(shift({ review }), { minutesBelow: 60, bands: b }, NO_WEATHER)
    expect(item.changedSinceReview).toBe(true)
    expect(item.light).toMatchObject({ minutesBelow: 60, sunDownMinutes: 60 })
    expect(item.crew).toEqual({ count: 2, names: ['A', 'B'], alone: false, nobody: false })
    expect(shapeReviewQueueItem(shift(), { minutesBelow: 60, bands: b }, NO_WEATHER).changedSinceReview).toBe(false)
  })

  it('orders soonest first, then by more minutes below', () => {
    const b = bands(['night', 60])
    const make = (start: string, minutesBelow: number) => shapeReviewQueueItem(shift({ start }), { minutesBelow, bands: b }, NO_WEATHER)
    const items: ReviewQueueItem[] = [make('2026-12-15T09:00:00+01:00', 10), make('2026-12-14T09:00:00+01:00', 10), make('2026-12-14T09:00:00+01:00', 50)]
    expect(items.sort(compareReviewQueueItems).map(i => [i.shift.start.slice(8, 10), i.minutesBelow])).toEqual([['14', 50], ['14', 10], ['15', 10]])
  })
})
