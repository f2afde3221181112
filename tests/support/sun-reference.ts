// Outside reference for the light engine's tests: astronomy-engine 2.1.19 (npm; VSOP87 with
// precession, nutation and aberration; its author states agreement with NOVAS within about ±1′).
// Geometric altitude = Observer + Equator(ofdate, aberration) + Horizon WITHOUT refraction (its
// 'normal' option would add refraction). Crossings come from its own SearchAltitude, which uses the
// same unrefracted altitude. Used only in tests and benchmarks, never by the product.
import { Body, Equator, Horizon, MakeTime, Observer, SearchAltitude, SearchHourAngle } from 'astronomy-engine'

export const REFERENCE_THRESHOLDS = [-18, -12, -6, -0.833] as const
export const REFERENCE_KINDS = ['night', 'astronomical', 'nautical', 'civil', 'day'] as const
export type ReferenceKind = typeof REFERENCE_KINDS[number]

const DAY_MS = 86_400_000

export interface ReferenceCrossing {
  ms: number
  level: number
  rising: boolean
}

export interface ReferencePeriod {
  kind: ReferenceKind
  startMs: number
  endMs: number
}

/** astronomy-engine's geometric (unrefracted) altitude of the sun's centre, degrees. */
export function referenceAltitude(ms: number, latitude: number, longitude: number): number {
  const observer = new Observer(latitude, longitude, 0)
  const date = new Date(ms)
  const eq = Equator(Body.Sun, date, observer, true, true)
  return Horizon(date, observer, eq.ra, eq.dec).altitude
}

/** astronomy-engine's azimuth of the sun, degrees from true north, clockwise. */
export function referenceAzimuth(ms: number, latitude: number, longitude: number): number {
  const observer = new Observer(latitude, longitude, 0)
  const date = new Date(ms)
  const eq = Equator(Body.Sun, date, observer, true, true)
  return Horizon(date, observer, eq.ra, eq.dec).azimuth
}

/** Band index (0 night … 4 day) of a geometric altitude. */
export function referenceBandIndex(altitude: number): number {
  let band = 0
  while (band < REFERENCE_THRESHOLDS.length && altitude >= REFERENCE_THRESHOLDS[band]!) band++
  return band
}

/** Every crossing of the four thresholds in [fromMs, toMs], from astronomy-engine's SearchAltitude, in time order. */
export function findReferenceCrossings(latitude: number, longitude: number, fromMs: number, toMs: number): ReferenceCrossing[] {
  const observer = new Observer(latitude, longitude, 0)
  const out: ReferenceCrossing[] = []
  REFERENCE_THRESHOLDS.forEach((threshold, level) => {
    for (const direction of [1, -1]) {
      let t = MakeTime(new Date(fromMs))
      for (let guard = 0; guard < 2000; guard++) {
        const limit = (toMs - t.date.getTime()) / DAY_MS
        if (limit <= 0) break
        const found = SearchAltitude(Body.Sun, observer, direction, t, limit, threshold)
        if (!found) break
        out.push({ ms: found.date.getTime(), level, rising: direction === 1 })
        t = found.AddDays(1 / 86_400)
      }
    }
  })
  return out.sort((a, b) => a.ms - b.ms)
}

/** A reference light timeline over [fromMs, toMs]: the band at the start, then its crossings. */
export class ReferenceTimeline {
  readonly crossings: ReferenceCrossing[]
  readonly startBand: number

  constructor(readonly latitude: number, readonly longitude: number, readonly fromMs: number, readonly toMs: number) {
    this.crossings = findReferenceCrossings(latitude, longitude, fromMs, toMs)
    this.startBand = referenceBandIndex(referenceAltitude(fromMs, latitude, longitude))
  }

  /** Periods covering [startMs, endMs) (inside the timeline's range), same-kind neighbours merged. */
  periodsIn(startMs: number, endMs: number): ReferencePeriod[] {
    let band = this.startBand
    const periods: ReferencePeriod[] = []
    for (const c of this.crossings) {
      if (c.ms <= startMs) {
        band = c.rising ? c.level + 1 : c.level
        continue
      }
      if (c.ms >= endMs) break
      if (periods.length === 0) periods.push({ kind: REFERENCE_KINDS[band]!, startMs, endMs })
      band = c.rising ? c.level + 1 : c.level
      const last = periods[periods.length - 1]!
      if (last.kind === REFERENCE_KINDS[band]) continue
      last.endMs = c.ms
      periods.push({ kind: REFERENCE_KINDS[band]!, startMs: c.ms, endMs })
    }
    if (periods.length === 0) periods.push({ kind: REFERENCE_KINDS[band]!, startMs, endMs })
    return periods
  }
}

/** Minutes of [startMs, endMs) outside the accepted bands, from a reference timeline. */
export function referenceMinutesOutside(timeline: ReferenceTimeline, startMs: number, endMs: number, accepted: readonly string[]): number {
  let ms = 0
  for (const p of timeline.periodsIn(startMs, endMs)) if (!accepted.includes(p.kind)) ms += p.endMs - p.startMs
  return ms / 60_000
}

/** Minutes outside the accepted bands by plain sampling of the reference altitude every stepMs (midpoint rule). */
export function sampleReferenceMinutesOutside(latitude: number, longitude: number, startMs: number, endMs: number, accepted: readonly string[], stepMs = 10_000): number {
  let ms = 0
  for (let t = startMs; t < endMs; t += stepMs) {
    const width = Math.min(stepMs, endMs - t)
    const kind = REFERENCE_KINDS[referenceBandIndex(referenceAltitude(t + width / 2, latitude, longitude))]!
    if (!accepted.includes(kind)) ms += width
  }
  return ms / 60_000
}

/**
 * Every local highest and lowest reference altitude in [startMs, endMs), plus the end points: sampled
 * every 10 minutes, each sampled extreme refined by golden-section search. For judging grazing days.
 */
export function referenceTurningAltitudes(latitude: number, longitude: number, startMs: number, endMs: number): number[] {
  const step = 10 * 60_000
  const f = (ms: number) => referenceAltitude(ms, latitude, longitude)
  const times: number[] = []
  for (let t = startMs; t < endMs; t += step) times.push(t)
  times.push(endMs)
  const values = times.map(f)
  const turning = [values[0]!, values[values.length - 1]!]
  for (let i = 1; i < values.length - 1; i++) {
    if (values[i]! >= values[i - 1]! && values[i]! >= values[i + 1]!) turning.push(goldenExtreme(f, times[i - 1]!, times[i + 1]!, 1))
    if (values[i]! <= values[i - 1]! && values[i]! <= values[i + 1]!) turning.push(goldenExtreme(f, times[i - 1]!, times[i + 1]!, -1))
  }
  return turning
}

// Golden-section search for the largest (sign 1) or smallest (sign −1) value of f on [a, b].
function goldenExtreme(f: (ms: number) => number, a: number, b: number, sign: number): number {
  const g = (Math.sqrt(5) - 1) / 2
  let c = b - g * (b - a)
  let d = a + g * (b - a)
  let fc = sign * f(c)
  let fd = sign * f(d)
  while (b - a > 1_000) {
    if (fc > fd) {
      b = d
      d = c
      fd = fc
      c = b - g * (b - a)
      fc = sign * f(c)
    } else {
      a = c
      c = d
      fc = fd
      d = a + g * (b - a)
      fd = sign * f(d)
    }
  }
  return sign * Math.max(fc, fd)
}

/** Reference daily highest and lowest altitude from the sun's meridian passages (SearchHourAngle 0 and 12) plus the day's ends. */
export function referenceDayExtremesByHourAngle(latitude: number, longitude: number, startMs: number, endMs: number): { max: number, min: number } {
  const observer = new Observer(latitude, longitude, 0)
  const values = [referenceAltitude(startMs, latitude, longitude), referenceAltitude(endMs, latitude, longitude)]
  for (const hourAngle of [0, 12]) {
    let t = MakeTime(new Date(startMs - DAY_MS / 4))
    for (let guard = 0; guard < 4; guard++) {
      const found = SearchHourAngle(Body.Sun, observer, hourAngle, t, 1)
      const ms = found.time.date.getTime()
      if (ms >= endMs) break
      // found.hor includes astronomy-engine's 'normal' refraction: take the geometric altitude instead.
      if (ms >= startMs) values.push(referenceAltitude(ms, latitude, longitude))
      t = found.time.AddDays(0.5)
    }
  }
  return { max: Math.max(...values), min: Math.min(...values) }
}
