// Sun position for the light engine: suncalc 2.x's position function, turned back into the
// geometric altitude the bands are defined on, plus the two numeric searches the engine uses.
// Pure TypeScript: no framework imports.
import { getPosition } from 'suncalc'

const RAD = Math.PI / 180

// suncalc 2.0.2 (node_modules/suncalc/index.js, astroRefraction) adds refraction by Meeus 16.4 in
// radians with the altitude clamped at 0: R(h) = 0.0002967 / tan(h + 0.00312536 / (h + 0.08901179)).
// These are its constants, copied so that its model can be inverted exactly.
const SUNCALC_REFRACTION_A = 0.0002967
const SUNCALC_REFRACTION_B = 0.00312536
const SUNCALC_REFRACTION_C = 0.08901179

/** Highest latitude used: at ±90° azimuth is undefined, so the poles are taken as ±89.9999°. */
export const MAX_SITE_LATITUDE = 89.9999

function refractSuncalcRad(hRad: number): number {
  const h = hRad < 0 ? 0 : hRad
  return SUNCALC_REFRACTION_A / Math.tan(h + SUNCALC_REFRACTION_B / (h + SUNCALC_REFRACTION_C))
}

/**
 * suncalc's refraction below the horizon, in degrees (≈ 0.484°). Because its model clamps the altitude
 * at 0, every geometric altitude h < 0 is reported as h + this constant.
 */
export const SUNCALC_HORIZON_REFRACTION_DEG = refractSuncalcRad(0) / RAD

/** suncalc 2.x's refraction for a geometric altitude, in degrees (exactly its model). */
export function computeSuncalcRefractionDeg(geometricDeg: number): number {
  return refractSuncalcRad(geometricDeg * RAD) / RAD
}

/** Inverts suncalc's apparent altitude (degrees) to the geometric altitude of the sun's centre. */
export function convertApparentToGeometric(apparentDeg: number): number {
  // Below the horizon the model adds a constant: subtracting it is exact.
  if (apparentDeg < SUNCALC_HORIZON_REFRACTION_DEG) return apparentDeg - SUNCALC_HORIZON_REFRACTION_DEG
  // Above it, h + R(h) is strictly increasing (1 + R'(h) ≥ 0.85), so Newton's method converges from
  // h0 = a − R(a) in a few steps; the root is ≥ 0 because a ≥ R(0).
  const a = apparentDeg * RAD
  let h = Math.max(0, a - refractSuncalcRad(a))
  for (let i = 0; i < 12; i++) {
    const u = h + SUNCALC_REFRACTION_B / (h + SUNCALC_REFRACTION_C)
    const du = 1 - SUNCALC_REFRACTION_B / ((h + SUNCALC_REFRACTION_C) * (h + SUNCALC_REFRACTION_C))
    const s = Math.sin(u)
    const g = h + SUNCALC_REFRACTION_A / Math.tan(u) - a
    const dg = 1 - SUNCALC_REFRACTION_A * du / (s * s)
    const step = g / dg
    h = Math.max(0, h - step)
    if (Math.abs(step) < 1e-14) break
  }
  return h / RAD
}

/** Rejects a non-finite or out-of-range latitude and pulls ±90° to ±89.9999°. */
export function normalizeSunLatitude(latitude: number): number {
  if (!Number.isFinite(latitude) || latitude < -90 || latitude > 90) {
    throw new RangeError(`latitude must be a number from -90 to 90, got ${latitude}`)
  }
  return Math.max(-MAX_SITE_LATITUDE, Math.min(MAX_SITE_LATITUDE, latitude))
}

/** Rejects a non-finite longitude and wraps any other into [−180, 180). */
export function normalizeSunLongitude(longitude: number): number {
  if (!Number.isFinite(longitude)) throw new RangeError(`longitude must be a finite number, got ${longitude}`)
  if (longitude >= -180 && longitude < 180) return longitude
  return ((((longitude + 180) % 360) + 360) % 360) - 180
}

// One reused Date: getPosition only reads it, and building a Date per sample is a measurable cost.
const SCRATCH_DATE = new Date(0)

/**
 * suncalc's apparent (refracted) altitude in degrees at an instant. The light engine searches on this
 * value directly: every band threshold is below the horizon, where apparent = geometric + the constant
 * SUNCALC_HORIZON_REFRACTION_DEG, so geometric h ≥ T exactly when apparent ≥ T + that constant.
 */
export function sampleSunApparentAltitude(ms: number, latitude: number, longitude: number): number {
  SCRATCH_DATE.setTime(ms)
  return getPosition(SCRATCH_DATE, latitude, longitude).altitude
}

/** Geometric altitude of the sun's centre (degrees) at an instant, from suncalc's position function. */
export function sampleSunAltitude(ms: number, latitude: number, longitude: number): number {
  return convertApparentToGeometric(sampleSunApparentAltitude(ms, latitude, longitude))
}

/** Geometric and apparent altitude and azimuth (degrees from true north, clockwise) at an instant. */
export function sampleSunPosition(ms: number, latitude: number, longitude: number): { altitude: number, apparent: number, azimuth: number } {
  SCRATCH_DATE.setTime(ms)
  const position = getPosition(SCRATCH_DATE, latitude, longitude)
  return { altitude: convertApparentToGeometric(position.altitude), apparent: position.altitude, azimuth: position.azimuth }
}

/**
 * The sun's apparent declination (degrees) in suncalc's model. suncalc does not export its sunCoords,
 * but at latitude 90° its altitude formula asin(sin φ sin δ + cos φ cos δ cos H) reduces to δ
 * (cos 90° ≈ 6e-17), so the geometric altitude seen from the pole is the declination.
 */
export function sampleSunDeclination(ms: number): number {
  SCRATCH_DATE.setTime(ms)
  return convertApparentToGeometric(getPosition(SCRATCH_DATE, 90, 0).altitude)
}

/**
 * Brent's method (Brent 1973; as in Numerical Recipes `zbrent`): a root of f in [a, b] given
 * f(a) = fa and f(b) = fb of opposite sign (or one zero), to within `tol` of the true root.
 * Returns the best estimate inside the final bracket. Never runs more than `maxIter` evaluations.
 */
export function solveRootBrent(f: (x: number) => number, a: number, b: number, fa: number, fb: number, tol: number, maxIter = 80): number {
  if (fa === 0) return a
  if (fb === 0) return b
  let c = a
  let fc = fa
  let d = b - a
  let e = d
  for (let iter = 0; iter < maxIter; iter++) {
    if ((fb > 0) === (fc > 0)) {
      // The root is between a and b: c becomes the far end of the bracket again.
      c = a
      fc = fa
      d = b - a
      e = d
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      // Keep b the better estimate: rotate (a, b, c) to (b, c, b).
      a = b
      b = c
      c = a
      fa = fb
      fb = fc
      fc = fa
    }
    const tol1 = 4e-16 * Math.abs(b) + 0.5 * tol
    const xm = 0.5 * (c - b)
    if (Math.abs(xm) <= tol1 || fb === 0) return fb === 0 || fb === fc ? b : b - fb * (c - b) / (fc - fb)
    brentStep(a, b, c, fa, fb, fc, xm, d, e, tol1)
    d = STEP_OUT[0]!
    e = STEP_OUT[1]!
    a = b
    fa = fb
    b += Math.abs(d) > tol1 ? d : (xm > 0 ? tol1 : -tol1)
    fb = f(b)
  }
  return b
}

/**
 * Brent's method as above, but first tests a predicted root: f is evaluated at guess ± halfWidth and
 * the bracket narrowed to whichever side holds the sign change, so a good prediction (within
 * halfWidth ≤ tol / 2) settles the root in two evaluations. A poor one costs those two and no more.
 */
export function solveRootNearGuess(f: (x: number) => number, a: number, b: number, fa: number, fb: number, guess: number, halfWidth: number, tol: number): number {
  const lo = guess - halfWidth
  const hi = guess + halfWidth
  if (!(lo > a && hi < b)) return solveRootBrent(f, a, b, fa, fb, tol)
  const flo = f(lo)
  if ((flo > 0) !== (fa > 0)) return solveRootBrent(f, a, lo, fa, flo, tol)
  const fhi = f(hi)
  if ((fhi > 0) !== (flo > 0)) return solveRootBrent(f, lo, hi, flo, fhi, tol)
  return solveRootBrent(f, hi, b, fhi, fb, tol)
}

// The search helpers hand back their step (d, e) here rather than in a new object per iteration.
const STEP_OUT = new Float64Array(2)

function setStep(d: number, e: number) {
  STEP_OUT[0] = d
  STEP_OUT[1] = e
}

// One interpolation step of Brent's root finder (inverse quadratic or secant, else bisection).
function brentStep(a: number, b: number, c: number, fa: number, fb: number, fc: number, xm: number, d: number, e: number, tol1: number) {
  if (Math.abs(e) < tol1 || Math.abs(fa) <= Math.abs(fb)) return setStep(xm, xm)
  const s = fb / fa
  let p: number
  let q: number
  if (a === c) {
    p = 2 * xm * s
    q = 1 - s
  } else {
    const qq = fa / fc
    const r = fb / fc
    p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1))
    q = (qq - 1) * (r - 1) * (s - 1)
  }
  if (p > 0) q = -q
  p = Math.abs(p)
  if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) return setStep(p / q, d)
  setStep(xm, xm)
}

const GOLDEN_FRACTION = 0.3819660112501051

/**
 * Brent's minimisation (parabolic interpolation with golden-section safeguard; Numerical Recipes
 * `brent`) of f on [a, b], starting from an interior point x with f(x) = fx, to within `tol`.
 * When f(a) and f(b) are known they seed the first parabola, which saves the opening golden step.
 * Returns the minimising x and f there. Never runs more than `maxIter` evaluations.
 */
export function minimizeBrent(f: (x: number) => number, a: number, b: number, x: number, fx: number, tol: number, maxIter = 60, fa = NaN, fb = NaN): { x: number, fx: number } {
  const seeded = Number.isFinite(fa) && Number.isFinite(fb)
  let w = seeded ? a : x
  let v = seeded ? b : x
  let fw = seeded ? fa : fx
  let fv = seeded ? fb : fx
  let d = 0
  let e = seeded ? b - a : 0
  for (let iter = 0; iter < maxIter; iter++) {
    const xm = 0.5 * (a + b)
    const tol1 = tol + 4e-16 * Math.abs(x)
    const tol2 = 2 * tol1
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) break
    minimizeStep(x, w, v, fx, fw, fv, a, b, xm, d, e, tol1)
    d = STEP_OUT[0]!
    e = STEP_OUT[1]!
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1)
    const fu = f(u)
    if (fu <= fx) {
      // u is the new best: the bracket shrinks to the side of x that holds u.
      if (u >= x) a = x
      else b = x
      v = w
      fv = fw
      w = x
      fw = fx
      x = u
      fx = fu
      continue
    }
    if (u < x) a = u
    else b = u
    if (fu <= fw || w === x) {
      v = w
      fv = fw
      w = u
      fw = fu
    } else if (fu <= fv || v === x || v === w) {
      v = u
      fv = fu
    }
  }
  return { x, fx }
}

// One step of Brent's minimiser: a parabola through x, w, v when it is trustworthy, else golden section.
function minimizeStep(x: number, w: number, v: number, fx: number, fw: number, fv: number, a: number, b: number, xm: number, d: number, e: number, tol1: number) {
  if (Math.abs(e) > tol1) {
    const r = (x - w) * (fx - fv)
    let q = (x - v) * (fx - fw)
    let p = (x - v) * q - (x - w) * r
    q = 2 * (q - r)
    if (q > 0) p = -p
    q = Math.abs(q)
    if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (a - x) && p < q * (b - x)) {
      const dd = p / q
      const u = x + dd
      if (u - a < 2 * tol1 || b - u < 2 * tol1) return setStep(xm - x >= 0 ? tol1 : -tol1, d)
      return setStep(dd, d)
    }
  }
  const ee = x >= xm ? a - x : b - x
  setStep(GOLDEN_FRACTION * ee, ee)
}
