import { describe, expect, it } from 'vitest'
import { isForecastStale, summariseForecastForWindow } from '../../server/adapters/forecast'
import type { ForecastHour } from '../../server/adapters/forecast'

const HOUR = 3_600_000
const T0 = Date.parse('2026-12-01T06:00:00Z')

// Hand-made hourly values (invented for the test); the expected wind chills are ECCC chart cells.
function makeHours(values: [number | null, number | null, number | null][]): ForecastHour[] {
  return values.map(([temperatureC, windKmh, gustKmh], i) => ({
    at: new Date(T0 + i * HOUR).toISOString(), temperatureC, windKmh, gustKmh
  }))
}

describe('summariseForecastForWindow', () => {
  const hours = makeHours([
    [-8, 10, 15], // 06:00
    [-10, 20, 28], // 07:00: ECCC chart (memory) −10 °C, 20 km/h → −18
    [-20, 30, 45], // 08:00: ECCC chart (memory) −20 °C, 30 km/h → −33
    [-24, 3, 6], // 09:00: too calm for the index
    [-15, 15, 22] // 10:00
  ])

  it('finds the coldest, windiest and worst wind chill over the hours that bracket the window', () => {
    const summary = summariseForecastForWindow(hours, T0 + 1.5 * HOUR, T0 + 3.5 * HOUR)
    expect(summary).toMatchObject({
      firstHourAt: '2026-12-01T07:00:00.000Z',
      lastHourAt: '2026-12-01T10:00:00.000Z',
      hoursUsed: 4,
      coldestTemperatureC: -24,
      strongestWindKmh: 30,
      strongestGustKmh: 45
    })
    expect(summary!.worstWindChill).toMatchObject({ roundedC: -33, at: '2026-12-01T08:00:00.000Z' })
    // ECCC bands: −33 lies in −28 to −39 (10 to 30 minutes).
    expect(summary!.worstWindChill!.frostbite.key).toBe('high')
  })

  it('uses a single hour for a window that starts and ends on it', () => {
    expect(summariseForecastForWindow(hours, T0 + HOUR, T0 + HOUR)).toMatchObject({ hoursUsed: 1, worstWindChill: { roundedC: -18 } })
  })

  it('returns null when the forecast does not reach the window\'s start or end', () => {
    expect(summariseForecastForWindow(hours, T0 - HOUR, T0 + HOUR)).toBeNull()
    expect(summariseForecastForWindow(hours, T0 + 3 * HOUR, T0 + 5 * HOUR)).toBeNull()
    expect(summariseForecastForWindow([], T0, T0 + HOUR)).toBeNull()
  })

  it('returns null when an hour inside the window is missing or has no temperature or wind', () => {
    const gappy = hours.filter((_, i) => i !== 2)
    expect(summariseForecastForWindow(gappy, T0, T0 + 4 * HOUR)).toBeNull()
    const holey = makeHours([[-8, 10, 15], [null, 20, 28], [-20, 30, 45]])
    expect(summariseForecastForWindow(holey, T0, T0 + 2 * HOUR)).toBeNull()
  })

  it('tolerates missing gusts and says so with a null', () => {
    const noGusts = makeHours([[-8, 10, null], [-10, 20, null]])
    expect(summariseForecastForWindow(noGusts, T0, T0 + HOUR)).toMatchObject({ strongestGustKmh: null, strongestWindKmh: 20 })
  })

  it('gives no worst wind chill when the index is undefined in every hour (NWS/ECCC limits)', () => {
    const mild = makeHours([[12, 30, 40], [-5, 4, 8]])
    expect(summariseForecastForWindow(mild, T0, T0 + HOUR)).toMatchObject({ coldestTemperatureC: -5, worstWindChill: null })
  })

  it('returns null for a window that ends before it starts', () => {
    expect(summariseForecastForWindow(hours, T0 + 2 * HOUR, T0 + HOUR)).toBeNull()
  })
})

describe('isForecastStale', () => {
  const fetchedAt = '2026-12-01T06:00:00.000Z'

  it('counts a forecast as fresh up to six hours and stale after', () => {
    expect(isForecastStale(fetchedAt, T0 + 6 * HOUR)).toBe(false)
    expect(isForecastStale(fetchedAt, T0 + 6 * HOUR + 1)).toBe(true)
  })

  it('honours another maximum age', () => {
    expect(isForecastStale(fetchedAt, T0 + 2 * HOUR, 1)).toBe(true)
    expect(isForecastStale(new Date(T0), T0 + 2 * HOUR, 3)).toBe(false)
  })

  it('treats an unreadable fetch time as stale', () => {
    expect(isForecastStale('yesterday-ish', T0)).toBe(true)
  })
})
