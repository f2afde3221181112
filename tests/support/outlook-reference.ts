// Reference light for the outlook tests, from astronomy-engine (npm, VSOP87 with precession,
// nutation and aberration; its author states agreement with NOVAS within about ±1 arcminute),
// independent of suncalc and of the light engine. Local midnights come from date-fns-tz.
import { Body, Equator, Horizon, MakeTime, Observer } from 'astronomy-engine'
import { fromZonedTime } from 'date-fns-tz'

const MINUTE_MS = 60_000

/** Geometric (unrefracted) altitude of the sun's centre, degrees, by astronomy-engine. */
export function referenceAltitude(ms: number, latitude: number, longitude: number): number {
  const observer = new Observer(latitude, longitude, 0)
  const time = MakeTime(new Date(ms))
  const eq = Equator(Body.Sun, time, observer, true, true)
  // no refraction argument: Horizon returns the geometric altitude
  return Horizon(time, observer, eq.ra, eq.dec).altitude
}

/** Local midnight of a date in an IANA zone (date-fns-tz), epoch ms. */
export function referenceMidnight(date: string, timezone: string): number {
  return fromZonedTime(`${date}T00:00:00`, timezone).getTime()
}

/** The next local date. */
export function nextDate(date: string, days = 1): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

export interface ReferenceDay {
  date: string
  /** Minutes with the sun at or above −6° (civil light: day + civil twilight). */
  civilMinutes: number
  /** The sun's centre rises through −0.833° during the day. */
  hasSunrise: boolean
  /** The sun stays below −0.833° all day. */
  polarNight: boolean
  /** The sun stays at or above −0.833° all day. */
  midnightSun: boolean
}

/**
 * The reference's figures for each local day: the altitude sampled every `stepMinutes`, crossings of
 * −6° placed by linear interpolation between samples (error well under a minute at this step).
 */
export function referenceDays(latitude: number, longitude: number, timezone: string, from: string, count: number, stepMinutes = 10): ReferenceDay[] {
  const out: ReferenceDay[] = []
  let date = from
  for (let i = 0; i < count; i++) {
    const start = referenceMidnight(date, timezone)
    const end = referenceMidnight(nextDate(date), timezone)
    const step = stepMinutes * MINUTE_MS
    let civil = 0
    let maxAlt = -90
    let minAlt = 90
    let hasSunrise = false
    let prevT = start
    let prevA = referenceAltitude(start, latitude, longitude)
    for (let t = start + step; prevT < end; t = Math.min(t + step, end)) {
      const a = referenceAltitude(t, latitude, longitude)
      civil += aboveFraction(prevA, a, -6) * (t - prevT)
      if (prevA < -0.833 && a >= -0.833) hasSunrise = true
      maxAlt = Math.max(maxAlt, prevA, a)
      minAlt = Math.min(minAlt, prevA, a)
      prevT = t
      prevA = a
    }
    out.push({ date, civilMinutes: civil / MINUTE_MS, hasSunrise, polarNight: maxAlt < -0.833, midnightSun: minAlt >= -0.833 })
    date = nextDate(date)
  }
  return out
}

// Fraction of a straight segment from a0 to a1 that lies at or above the threshold.
function aboveFraction(a0: number, a1: number, threshold: number): number {
  if (a0 >= threshold && a1 >= threshold) return 1
  if (a0 < threshold && a1 < threshold) return 0
  const f = (threshold - a0) / (a1 - a0)
  return a0 < threshold ? 1 - f : f
}

/** Lowest reference altitude over [startMs, endMs], sampled every minute and at both ends. */
export function referenceMinAltitude(startMs: number, endMs: number, latitude: number, longitude: number): number {
  let min = Math.min(referenceAltitude(startMs, latitude, longitude), referenceAltitude(endMs, latitude, longitude))
  for (let t = startMs + MINUTE_MS; t < endMs; t += MINUTE_MS) min = Math.min(min, referenceAltitude(t, latitude, longitude))
  return min
}

/** Whole days from a to b. */
export function daysApart(a: string, b: string): number {
  return Math.abs(Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000))
}
