// The outing in words and figures in a person's units. Conversion factors are exact by definition
// (international yard and pound agreement, 1959: 1 ft = 0.3048 m, 1 mile = 1.609344 km); −40 is the
// same on both temperature scales (°F = °C × 9/5 + 32).
import { describe, expect, it } from 'vitest'
import { describeHoldCause, describeOuting } from '../../shared/field'
import { formatTemperature, formatVisibility, formatWind } from '../../shared/units'

describe('the outing in words', () => {
  it('says when to leave and be back around the time on site', () => {
    expect(describeOuting('2027-02-20T10:00:00+01:00', '2027-02-20T13:00:00+01:00', 90, 'Europe/Oslo')).toBe('leave 08:30, on site 10:00–13:00, back 14:30')
  })

  it('says only the time on site with no travel', () => {
    expect(describeOuting('2027-02-20T10:00:00+01:00', '2027-02-20T13:00:00+01:00', 0, 'Europe/Oslo')).toBe('on site 10:00–13:00')
  })

  it('reads the wall clock across the spring change (Europe/Oslo, 28 March 2027 02:00 → 03:00, tz database)', () => {
    // on site 03:30–05:00 local (CEST); leaving 90 minutes earlier is 01:00 CET
    expect(describeOuting('2027-03-28T03:30:00+02:00', '2027-03-28T05:00:00+02:00', 90, 'Europe/Oslo')).toBe('leave 01:00, on site 03:30–05:00, back 06:30')
  })
})

describe('figures in the person\'s units', () => {
  it('converts temperature, wind and visibility exactly', () => {
    expect(formatTemperature(-40, 'imperial')).toBe('−40 °F')
    expect(formatTemperature(-40, 'metric')).toBe('−40 °C')
    expect(formatWind(160.9344, 'imperial')).toBe('100 mph')
    expect(formatVisibility(304.8, 'imperial')).toBe('1000 ft')
    expect(formatWind(null, 'metric')).toBe('—')
  })

  it('words a hold\'s cause with the level\'s own figure', () => {
    expect(describeHoldCause({ cause: 'windChillC', value: -46, limit: -40 })).toBe('Wind chill −46 °C (this level: −40 °C or colder)')
    expect(describeHoldCause({ cause: 'windKmh', value: 80.4672, limit: 64.3738 }, 'imperial')).toBe('Wind 50 mph (this level: 40 mph or more)')
    expect(describeHoldCause({ cause: 'visibilityM', value: 150, limit: 200 })).toBe('Visibility 150 m (this level: 200 m or less)')
  })
})
