// The sun position layer: suncalc 2.0.2's refraction undone exactly, checked against astronomy-engine
// 2.1.19's unrefracted altitude, and the two numeric searches the engine relies on.
import { getPosition } from 'suncalc'
import { describe, expect, it } from 'vitest'
import {
  SUNCALC_HORIZON_REFRACTION_DEG,
  computeSuncalcRefractionDeg,
  convertApparentToGeometric,
  minimizeBrent,
  normalizeSunLatitude,
  normalizeSunLongitude,
  sampleSunAltitude,
  sampleSunApparentAltitude,
  sampleSunDeclination,
  sampleSunPosition,
  solveRootBrent,
  solveRootNearGuess
} from '../../server/core/sun/position'
import { referenceAltitude, referenceAzimuth } from '../support/sun-reference'

describe('suncalc refraction, undone', () => {
  it('adds a constant ~0.484° below the horizon, as its clamped Meeus 16.4 model implies', () => {
    // docs/references.md (measured of suncalc 2.x): Meeus 16.4 evaluated at altitude 0 below the horizon, ≈ 0.484°.
    expect(SUNCALC_HORIZON_REFRACTION_DEG).toBeCloseTo(0.484, 3)
    expect(computeSuncalcRefractionDeg(-5)).toBe(SUNCALC_HORIZON_REFRACTION_DEG)
    expect(computeSuncalcRefractionDeg(10)).toBeLessThan(0.1)
  })

  it('inverts the model exactly from −30° to +90°', () => {
    let worst = 0
    for (let h = -30; h <= 90; h += 0.0137) {
      worst = Math.max(worst, Math.abs(convertApparentToGeometric(h + computeSuncalcRefractionDeg(h)) - h))
    }
    expect(worst).toBeLessThan(1e-9)
  })

  it('matches suncalc\'s own getPosition output', () => {
    const ms = Date.parse('2026-05-04T03:10:00Z')
    expect(sampleSunApparentAltitude(ms, 69.65, 18.96)).toBe(getPosition(new Date(ms), 69.65, 18.96).altitude)
  })

  it('agrees with astronomy-engine\'s unrefracted altitude within 0.02° (and would not without the inversion)', () => {
    // docs/references.md, "Measured for this page": suncalc vs astronomy-engine geometric altitude, max 0.016°.
    let worst = 0
    let worstBelowWithoutInversion = Infinity
    for (const [lat, lon] of [[0, 0], [45, 7.7], [69.65, 18.96], [78.22, 15.65], [-77.85, 166.67], [-89.5, 0]] as const) {
      for (let k = 0; k < 120; k++) {
        const ms = Date.parse('2026-01-01T00:00:00Z') + k * 73 * 3_600_000 + k * 97_000
        const reference = referenceAltitude(ms, lat, lon)
        worst = Math.max(worst, Math.abs(sampleSunAltitude(ms, lat, lon) - reference))
        if (reference < -1) worstBelowWithoutInversion = Math.min(worstBelowWithoutInversion, Math.abs(sampleSunApparentAltitude(ms, lat, lon) - reference))
      }
    }
    expect(worst).toBeLessThan(0.02)
    expect(worstBelowWithoutInversion).toBeGreaterThan(0.45)
  })

  it('gives azimuths from true north, clockwise, as astronomy-engine does', () => {
    let worst = 0
    for (let k = 0; k < 100; k++) {
      const ms = Date.parse('2026-03-01T00:00:00Z') + k * 5_300_000
      const ours = sampleSunPosition(ms, 69.65, 18.96).azimuth
      const diff = Math.abs(((ours - referenceAzimuth(ms, 69.65, 18.96) + 540) % 360) - 180)
      worst = Math.max(worst, diff)
    }
    expect(worst).toBeLessThan(0.05)
  })

  it('reads the declination from the altitude seen at the pole', () => {
    // Common practice: δ ≈ 0 at the equinox, ≈ +23.44° (the obliquity) at the June solstice.
    expect(Math.abs(sampleSunDeclination(Date.parse('2026-03-20T14:46:00Z')))).toBeLessThan(0.01)
    expect(sampleSunDeclination(Date.parse('2026-06-21T08:25:00Z'))).toBeCloseTo(23.44, 1)
  })
})

describe('numeric searches', () => {
  it('finds a root with Brent\'s method to the tolerance', () => {
    let calls = 0
    const root = solveRootBrent((x) => { calls++; return Math.cos(x) }, 1, 2, Math.cos(1), Math.cos(2), 1e-9)
    expect(Math.abs(root - Math.PI / 2)).toBeLessThan(1e-9)
    expect(calls).toBeLessThan(12)
  })

  it('settles a good predicted root in two evaluations and survives a bad prediction', () => {
    let calls = 0
    const f = (x: number) => { calls++; return x - 7.25 }
    expect(Math.abs(solveRootNearGuess(f, 0, 10, -7.25, 2.75, 7.3, 0.5, 1) - 7.25)).toBeLessThan(1)
    expect(calls).toBe(2)
    expect(Math.abs(solveRootNearGuess(f, 0, 10, -7.25, 2.75, 2, 0.5, 1e-6) - 7.25)).toBeLessThan(1e-6)
  })

  it('finds a minimum with Brent\'s minimiser, with and without seeded ends', () => {
    const f = (x: number) => (x - 3.2) ** 2 + 1
    expect(minimizeBrent(f, 0, 10, 5, f(5), 1e-6).x).toBeCloseTo(3.2, 5)
    expect(minimizeBrent(f, 0, 10, 5, f(5), 1e-6, 60, f(0), f(10)).x).toBeCloseTo(3.2, 5)
  })

  it('normalises coordinates and rejects impossible ones', () => {
    expect(normalizeSunLatitude(90)).toBe(89.9999)
    expect(normalizeSunLatitude(-90)).toBe(-89.9999)
    expect(() => normalizeSunLatitude(90.5)).toThrow(/latitude/)
    expect(normalizeSunLongitude(190)).toBeCloseTo(-170, 9)
    expect(normalizeSunLongitude(-540)).toBeCloseTo(-180, 9)
    expect(() => normalizeSunLongitude(Number.POSITIVE_INFINITY)).toThrow(/longitude/)
  })
})
