// Conversions behind every figure shown in a person's units. The factors are exact by definition:
// international yard and pound agreement (1959), also NIST SP 811 appendix B: 1 ft = 0.3048 m,
// 1 mile = 1609.344 m so 1 mph = 1.609344 km/h; NIST SP 811 §4.2.1.1: °F = °C × 9/5 + 32.
import { describe, expect, it } from 'vitest'
import { formatElevation, formatTemperature, formatVisibility, formatWind, fromFeet, toFahrenheit, toFeet, toMph, UNIT_SYMBOLS } from '../../shared/units'

describe('unit conversions (exact factors, NIST SP 811)', () => {
  it('turns °C into °F at the fixed points and where the scales meet', () => {
    expect(toFahrenheit(0)).toBe(32) // freezing point of water
    expect(toFahrenheit(100)).toBe(212) // boiling point of water at one atmosphere
    expect(toFahrenheit(-40)).toBe(-40) // the two scales cross at −40
    expect(toFahrenheit(-26)).toBeCloseTo(-14.8, 12)
  })

  it('turns km/h into mph with 1 mph = 1.609344 km/h', () => {
    expect(toMph(1.609344)).toBeCloseTo(1, 12)
    expect(toMph(160.9344)).toBeCloseTo(100, 12)
    expect(toMph(32)).toBeCloseTo(19.8839, 4)
  })

  it('turns metres into feet with 1 ft = 0.3048 m', () => {
    expect(toFeet(0.3048)).toBeCloseTo(1, 12)
    expect(toFeet(1609.344)).toBeCloseTo(5280, 9) // one statute mile
    expect(toFeet(1000)).toBeCloseTo(3280.8399, 4)
  })

  it('turns feet entered by a person back into metres', () => {
    expect(fromFeet(1000)).toBeCloseTo(304.8, 12)
    expect(fromFeet(5280)).toBeCloseTo(1609.344, 9) // one statute mile
    expect(fromFeet(toFeet(812))).toBeCloseTo(812, 9)
  })
})

describe('figures printed in the person\'s units', () => {
  it('prints the same cold figure in each set, with a true minus sign', () => {
    expect(formatTemperature(-28, 'metric')).toBe('−28 °C')
    expect(formatTemperature(-28, 'imperial')).toBe('−18 °F') // −18.4 °F
    expect(formatWind(40, 'metric')).toBe('40 km/h')
    expect(formatWind(40, 'imperial')).toBe('25 mph') // 24.85 mph
  })

  it('prints distances in feet for imperial people', () => {
    expect(formatVisibility(200, 'imperial')).toBe('656 ft') // 656.17 ft
    expect(formatVisibility(200, 'metric')).toBe('200 m')
    expect(formatElevation(812, 'imperial')).toBe('2664 ft') // 2664.04 ft
    expect(formatElevation(812, 'metric')).toBe('812 m')
    expect(formatElevation(-30, 'imperial')).toBe('−98 ft') // −98.43 ft, below sea level
    expect(formatElevation(null, 'imperial')).toBe('—')
  })

  it('names each set\'s symbols', () => {
    expect(UNIT_SYMBOLS.imperial).toEqual({ temperature: '°F', wind: 'mph', distance: 'ft' })
    expect(UNIT_SYMBOLS.metric).toEqual({ temperature: '°C', wind: 'km/h', distance: 'm' })
  })
})
