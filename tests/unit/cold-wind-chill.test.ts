import { describe, expect, it } from 'vitest'
import { classifyFrostbiteRisk, computeWindChill, convertFahrenheitToCelsius, convertMphToKmh } from '../../server/core/cold/index'

// National Weather Service Wind Chill Chart (2001 index): [air °F, wind mph, chart °F].
// The first two cells are the NWS examples quoted in docs/references.md (the second is also OSHA's
// cold stress example); the other cells are the chart as remembered (memory), each also
// re-derived from the published formula before being written here.
const NWS_CHART_CELLS: [number, number, number][] = [
  [0, 15, -19],
  [40, 35, 28],
  [40, 5, 36], // memory
  [30, 10, 21], // memory
  [20, 20, 4], // memory
  [10, 30, -12], // memory
  [5, 25, -17], // memory
  [-10, 15, -32], // memory
  [-20, 40, -57], // memory
  [-30, 5, -46], // memory
  [-45, 60, -98], // memory
  [35, 60, 17] // memory
]

// Environment and Climate Change Canada wind chill calculation chart: [air °C, wind km/h, chart °C],
// all as remembered (memory), each re-derived from the published formula.
const ECCC_CHART_CELLS: [number, number, number][] = [
  [-20, 30, -33], // memory
  [-10, 20, -18], // memory
  [-30, 50, -49], // memory; the formula gives −49.03, so −49 (not −48)
  [5, 5, 4], // memory
  [0, 10, -3], // memory
  [-5, 25, -12], // memory
  [-15, 15, -23], // memory
  [-25, 5, -30], // memory
  [-35, 20, -49], // memory
  [-40, 30, -59], // memory
  [-50, 50, -76] // memory
]

describe('computeWindChill against the published charts', () => {
  it.each(NWS_CHART_CELLS)('imperial: %d °F with %d mph reads %d °F on the NWS chart', (t, v, chart) => {
    const result = computeWindChill(t, v, 'imperial')
    expect(result.rounded).toBe(chart)
    expect(result.reason).toBeNull()
    expect(Math.abs(result.exact! - chart)).toBeLessThanOrEqual(0.5)
  })

  it.each(ECCC_CHART_CELLS)('metric: %d °C with %d km/h reads %d °C on the ECCC chart', (t, v, chart) => {
    const result = computeWindChill(t, v, 'metric')
    expect(result.rounded).toBe(chart)
    expect(result.reason).toBeNull()
  })

  // NWS and ECCC publish one index in two unit systems; their rounded coefficients agree closely.
  it('gives the same index in both unit systems for the same conditions (NWS vs ECCC formula)', () => {
    for (const [tF, vMph] of [[0, 15], [-20, 40], [30, 10], [-45, 60]] as const) {
      const imperialC = convertFahrenheitToCelsius(computeWindChill(tF, vMph, 'imperial').exact!)
      const metricC = computeWindChill(convertFahrenheitToCelsius(tF), convertMphToKmh(vMph), 'metric').exact!
      expect(Math.abs(imperialC - metricC)).toBeLessThan(0.2)
    }
  })
})

describe('computeWindChill outside its defined range (NWS / ECCC: T ≤ 10 °C / 50 °F, V > 4.8 km/h / 3 mph)', () => {
  it('returns null as too-warm above 10 °C and above 50 °F', () => {
    expect(computeWindChill(10.1, 30, 'metric')).toMatchObject({ rounded: null, exact: null, reason: 'too-warm' })
    expect(computeWindChill(50.5, 30, 'imperial')).toMatchObject({ rounded: null, exact: null, reason: 'too-warm' })
  })

  // Both charts stop short of these edges; the values are worked by hand from the published formulas
  // (30^0.16 = 1.72264): metric 19.335 − 19.586 + 6.830 = 6.58; imperial 66.815 − 61.584 + 36.821 = 42.05.
  it('still computes at exactly 10 °C and 50 °F', () => {
    expect(computeWindChill(10, 30, 'metric').rounded).toBe(7)
    expect(computeWindChill(50, 30, 'imperial').rounded).toBe(42)
  })

  it('returns null as too-calm at or below 4.8 km/h and 3 mph, including no wind', () => {
    expect(computeWindChill(-20, 4.8, 'metric')).toMatchObject({ rounded: null, reason: 'too-calm' })
    expect(computeWindChill(-20, 0, 'metric')).toMatchObject({ rounded: null, reason: 'too-calm' })
    expect(computeWindChill(-4, 3, 'imperial')).toMatchObject({ rounded: null, reason: 'too-calm' })
  })

  it('computes just above the calm limit', () => {
    expect(computeWindChill(-20, 4.9, 'metric').rounded).not.toBeNull()
    expect(computeWindChill(-4, 3.1, 'imperial').rounded).not.toBeNull()
  })

  it('refuses non-finite or negative input instead of inventing a figure', () => {
    expect(() => computeWindChill(Number.NaN, 10, 'metric')).toThrow(/temperature/)
    expect(() => computeWindChill(-10, -1, 'metric')).toThrow(/wind/)
  })
})

describe('classifyFrostbiteRisk at the ECCC band boundaries (wind chill °C, whole degrees)', () => {
  it.each([
    [0, 'low'],
    [-9, 'low'],
    [-10, 'moderate'],
    [-27, 'moderate'],
    [-28, 'high'],
    [-39, 'high'],
    [-40, 'very-high'],
    [-47, 'very-high'],
    [-48, 'severe'],
    [-54, 'severe'],
    [-55, 'extreme'],
    [-70, 'extreme']
  ] as const)('%d °C falls in the %s band', (windChillC, key) => {
    expect(classifyFrostbiteRisk(windChillC).key).toBe(key)
  })

  it('states the freezing times the ECCC table gives for each band', () => {
    expect(classifyFrostbiteRisk(-30)).toMatchObject({ minMinutes: 10, maxMinutes: 30 })
    expect(classifyFrostbiteRisk(-45)).toMatchObject({ minMinutes: 5, maxMinutes: 10 })
    expect(classifyFrostbiteRisk(-50)).toMatchObject({ minMinutes: 2, maxMinutes: 5 })
    expect(classifyFrostbiteRisk(-60)).toMatchObject({ minMinutes: 0, maxMinutes: 2 })
    expect(classifyFrostbiteRisk(-20)).toMatchObject({ minMinutes: null, maxMinutes: null })
  })

  it('reads a fractional wind chill on its whole-degree value, as the table does', () => {
    expect(classifyFrostbiteRisk(-9.4)).toMatchObject({ key: 'low', wholeDegreeC: -9 })
    expect(classifyFrostbiteRisk(-9.6)).toMatchObject({ key: 'moderate', wholeDegreeC: -10 })
    expect(classifyFrostbiteRisk(-27.4).key).toBe('moderate')
    expect(classifyFrostbiteRisk(-39.6).key).toBe('very-high')
  })

  it('sends an exact half-degree to the colder band (cautious tie rule)', () => {
    expect(classifyFrostbiteRisk(-27.5)).toMatchObject({ key: 'high', wholeDegreeC: -28 })
    expect(classifyFrostbiteRisk(-54.5).key).toBe('extreme')
  })

  it('puts a wind chill above 0 in the lowest band', () => {
    expect(classifyFrostbiteRisk(4).key).toBe('low')
  })
})
