// The sun's daily course at a site, fast: suncalc's position function is asked every third UTC day for
// the sun's declination δ and right ascension α (read at the north pole, where its altitude is δ and
// its azimuth is the hour angle + 180°); in between both are interpolated (4-point Lagrange;
// errors below 4e-7 rad), and the rest is the closed-form spherical astronomy suncalc itself uses
// (Meeus, Astronomical Algorithms, 2nd ed.: sidereal time 12.4, altitude 13.6, azimuth 13.5):
//   sin h = sin φ sin δ + cos φ cos δ cos H,   H = θ0(t) + λ − α(t).
// Each day's highest and lowest point is found from the meridian passages (H = 0, π) with Newton steps
// on the analytic rate dh/dt; each threshold crossing is seeded from the closed-form hour angle
//   cos H0 = (sin h0 − sin φ sin δ) / (cos φ cos δ)
// of the two extremes around it and refined with Newton steps on the same rate, safeguarded by the
// bracket between the extremes (bisection when a step would leave it). Pure TypeScript.
import { getPosition } from 'suncalc'
import { SUNCALC_HORIZON_REFRACTION_DEG } from './position'

const RAD = Math.PI / 180
const TWO_PI = 2 * Math.PI
const DAY_MS = 86_400_000
// suncalc's day count: days since J2000.0 (2000-01-01T12:00 UT) of a UT instant
const J2000_DAYS_FROM_EPOCH = 10_957.5
// Greenwich mean sidereal time (Meeus 12.4, linear term, as suncalc 2.0.2 uses it), radians and per ms
const THETA0_RAD = 280.46061837 * RAD
const THETA_RATE_RAD_PER_DAY = 360.98564736629 * RAD
const THETA_RATE_PER_MS = THETA_RATE_RAD_PER_DAY / DAY_MS
// Spacing of the sampled δ and α: every third UTC midnight. Their fourth derivatives are at most
// ~1e-7 rad/day⁴ (the semiannual term of the equation of time), so the cubic's error stays under
// ~4e-7 rad (2e-5°): well under a second on a crossing even where the sun climbs slowly
// (tests/unit/light.course.test.ts checks every crossing of a year against suncalc itself).
const NODE_STEP_MS = 3 * DAY_MS
// Roots and extremes are settled to within this (the reported instants are whole seconds).
const TIME_TOLERANCE_MS = 20
const MAX_NEWTON_STEPS = 8
const EXTREMUM_LAST_STEP_MS = 2_000

function siderealRad(ms: number): number {
  return THETA0_RAD + THETA_RATE_RAD_PER_DAY * (ms / DAY_MS - J2000_DAYS_FROM_EPOCH)
}

/** δ and α at every third UTC midnight (α unwrapped so that it increases smoothly), from suncalc's position. */
export interface SunNodes {
  firstMs: number
  dec: Float64Array
  ra: Float64Array
}

const POLE_DATE = new Date(0)

/** Nodes covering [fromMs, toMs] with two spare nodes either side for the interpolation. */
export function sampleSunNodes(fromMs: number, toMs: number): SunNodes {
  const firstMs = (Math.floor(fromMs / NODE_STEP_MS) - 2) * NODE_STEP_MS
  const count = Math.ceil(toMs / NODE_STEP_MS) + 3 - Math.floor(fromMs / NODE_STEP_MS) + 2
  const dec = new Float64Array(count)
  const ra = new Float64Array(count)
  for (let i = 0; i < count; i++) {
    const ms = firstMs + i * NODE_STEP_MS
    POLE_DATE.setTime(ms)
    // at φ = 90° suncalc's altitude asin(sin φ sin δ + cos φ cos δ cos H) is δ (cos 90° ≈ 6e-17) and its
    // azimuth atan2(sin H, cos H sin φ − tan δ cos φ) + 180° is H + 180°, with λ = 0: α = θ0 − H
    const pole = getPosition(POLE_DATE, 90, 0)
    // below the horizon suncalc's refraction is a constant; when the sun is up at the north pole it is
    // down at the south pole (altitude −δ there), where subtracting that constant is exact again
    dec[i] = (pole.altitude < SUNCALC_HORIZON_REFRACTION_DEG
      ? pole.altitude - SUNCALC_HORIZON_REFRACTION_DEG
      : SUNCALC_HORIZON_REFRACTION_DEG - getPosition(POLE_DATE, -90, 0).altitude) * RAD
    let alpha = siderealRad(ms) - (pole.azimuth - 180) * RAD
    if (i > 0) alpha -= TWO_PI * Math.round((alpha - ra[i - 1]! - TWO_PI * NODE_STEP_MS / DAY_MS / 365.25) / TWO_PI)
    ra[i] = alpha
  }
  return { firstMs, dec, ra }
}

/** The course of the sun at one site over sampled nodes: altitude, its rate, and the searches. */
export class DiurnalCourse {
  readonly sinPhi: number
  readonly cosPhi: number
  readonly lambda: number
  // state of the last evaluation (at `atMs`)
  sinH = 0
  cosH = 0
  sinDec = 0
  cosDec = 0
  /** sin of the geometric altitude. */
  g = 0
  /** d(sin h)/dt, per ms. */
  rate = 0
  /** Hour angle, radians (not wrapped). */
  hourAngle = 0
  private atMs = NaN

  constructor(readonly nodes: SunNodes, latitudeDeg: number, longitudeDeg: number) {
    this.sinPhi = Math.sin(latitudeDeg * RAD)
    this.cosPhi = Math.cos(latitudeDeg * RAD)
    this.lambda = longitudeDeg * RAD
  }

  /** Evaluates the course at an instant: sets g (sin h), rate, hour angle and friends. */
  at(ms: number): number {
    if (ms === this.atMs) return this.g
    const { firstMs, dec, ra } = this.nodes
    const x = (ms - firstMs) / NODE_STEP_MS
    let i = Math.floor(x) - 1
    if (i < 0) i = 0
    else if (i > dec.length - 4) i = dec.length - 4
    const u = x - i - 1
    // Lagrange weights on nodes i .. i+3 at offsets −1, 0, 1, 2 from u, and their derivatives
    const um1 = u + 1
    const u1 = u - 1
    const u2 = u - 2
    const w0 = -u * u1 * u2 / 6
    const w1 = um1 * u1 * u2 / 2
    const w2 = -um1 * u * u2 / 2
    const w3 = um1 * u * u1 / 6
    const d0 = -(u1 * u2 + u * u2 + u * u1) / 6
    const d1 = (u1 * u2 + um1 * u2 + um1 * u1) / 2
    const d2 = -(u * u2 + um1 * u2 + um1 * u) / 2
    const d3 = (u * u1 + um1 * u1 + um1 * u) / 6
    const delta = w0 * dec[i]! + w1 * dec[i + 1]! + w2 * dec[i + 2]! + w3 * dec[i + 3]!
    const alpha = w0 * ra[i]! + w1 * ra[i + 1]! + w2 * ra[i + 2]! + w3 * ra[i + 3]!
    const deltaRate = (d0 * dec[i]! + d1 * dec[i + 1]! + d2 * dec[i + 2]! + d3 * dec[i + 3]!) / NODE_STEP_MS
    const alphaRate = (d0 * ra[i]! + d1 * ra[i + 1]! + d2 * ra[i + 2]! + d3 * ra[i + 3]!) / NODE_STEP_MS
    const H = siderealRad(ms) + this.lambda - alpha
    this.hourAngle = H
    this.sinH = Math.sin(H)
    this.cosH = Math.cos(H)
    this.sinDec = Math.sin(delta)
    this.cosDec = Math.cos(delta)
    const { sinPhi, cosPhi } = this
    this.g = sinPhi * this.sinDec + cosPhi * this.cosDec * this.cosH
    this.rate = (sinPhi * this.cosDec - cosPhi * this.sinDec * this.cosH) * deltaRate
      - cosPhi * this.cosDec * this.sinH * (THETA_RATE_PER_MS - alphaRate)
    this.atMs = ms
    return this.g
  }

  /** Geometric altitude, degrees, at an instant. */
  altitudeDeg(ms: number): number {
    const g = this.at(ms)
    return Math.asin(g > 1 ? 1 : g < -1 ? -1 : g) / RAD
  }

  /** Azimuth, degrees from north clockwise, of the last evaluation (suncalc's formula). */
  azimuthDeg(): number {
    const tanDec = this.sinDec / this.cosDec
    return (Math.atan2(this.sinH, this.cosH * this.sinPhi - tanDec * this.cosPhi) / RAD + 540) % 360
  }

  /** The instant near `guessMs` at which the hour angle is `targetRad` (Newton; H grows ~2π a day). */
  findHourAngle(guessMs: number, targetRad: number): number {
    let t = guessMs
    for (let k = 0; k < MAX_NEWTON_STEPS; k++) {
      this.at(t)
      let diff = (this.hourAngle - targetRad) % TWO_PI
      if (diff > Math.PI) diff -= TWO_PI
      else if (diff < -Math.PI) diff += TWO_PI
      const step = diff / (THETA_RATE_PER_MS - 0.0172 / DAY_MS)
      t -= step
      if (Math.abs(step) < TIME_TOLERANCE_MS) break
    }
    return t
  }

  /**
   * The extreme (highest when `isMax`) nearest a meridian passage at `passageMs`: Newton on the rate,
   * with d²(sin h)/dt² ≈ −cos φ cos δ cos H Ḣ². Null when it does not settle within 6 h of the
   * passage (within a few hundredths of a degree of a pole, where the altitude may not turn daily).
   */
  findExtremum(passageMs: number, isMax: boolean): { ms: number, g: number } | null {
    let t = passageMs
    const omega = THETA_RATE_PER_MS - 0.0172 / DAY_MS
    for (let k = 0; k < MAX_NEWTON_STEPS; k++) {
      this.at(t)
      const curvature = -this.cosPhi * this.cosDec * this.cosH * omega * omega
      if ((isMax && curvature >= 0) || (!isMax && curvature <= 0)) return null
      const step = this.rate / curvature
      t -= step
      if (Math.abs(t - passageMs) > 6 * 3_600_000) return null
      // Newton converges quadratically here: a last step under 2 s leaves the turning point within a
      // few ms, and the altitude then differs from the last evaluated one by under 1e-9°
      if (Math.abs(step) < EXTREMUM_LAST_STEP_MS) return { ms: t, g: this.g }
    }
    return null
  }

  /**
   * The instant in (loMs, hiMs) where sin h = target, the course being monotone there with sin h
   * going from gLo to gHi; `seedMs` is the closed-form guess. Safeguarded Newton: a step that leaves
   * the bracket is replaced by bisection, and the bracket shrinks with every evaluation.
   */
  findCrossing(loMs: number, hiMs: number, gLo: number, gHi: number, target: number, seedMs: number): number {
    const rising = gHi > gLo
    let lo = loMs
    let hi = hiMs
    let t = seedMs > lo && seedMs < hi ? seedMs : 0.5 * (lo + hi)
    for (let k = 0; k < 60; k++) {
      const f = this.at(t) - target
      if (f === 0) return t
      if ((f > 0) === rising) hi = t
      else lo = t
      let next = this.rate !== 0 ? t - f / this.rate : NaN
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi)
      const step = Math.abs(next - t)
      t = next
      if (step < TIME_TOLERANCE_MS || hi - lo < TIME_TOLERANCE_MS) return t
    }
    return t
  }
}
