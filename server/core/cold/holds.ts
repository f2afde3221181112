// Weather holds: the operator's own levels (names, figures and advice are theirs; the product names
// none), evaluated over the hours of a shift's outing. Common practice in polar programmes is a few
// "conditions", each reached when any one of wind, wind chill or visibility reaches its figure, each
// with its own travel rule (docs/references.md, "Work hours and people"). Pure: plain inputs and outputs.
import type { HoldLevel } from '../../../shared/types/shift'
import { computeWindChill } from './index'

export const HOLD_CAUSES = ['windKmh', 'windChillC', 'visibilityM'] as const
export type HoldCause = typeof HOLD_CAUSES[number]

export type { HoldLevel }

/** One hour of weather at the site: null where the source has no figure. */
export interface HoldHour {
  atMs: number
  temperatureC: number | null
  windKmh: number | null
  visibilityM: number | null
}

export interface WeatherHold {
  /** The most severe level reached in any hour. */
  level: string
  /** The first hour that level is reached. */
  atMs: number
  /** Which figure reached it in that hour (the first of wind, wind chill, visibility that did). */
  cause: HoldCause
  advice: string
  /** The hour's figure that reached it, and the level's figure, for the words. */
  value: number
  limit: number
}

const HOUR_MS = 3_600_000

/**
 * The wind chill of an hour (2001 North American index, metric) in whole degrees as the published
 * charts print it, and as the product shows it, so an operator's figure read off a chart compares
 * like with like; null where the index is not defined (air above 10 °C or wind at or below
 * 4.8 km/h): no wind-chill figure is then reached.
 */
export function hourWindChillC(hour: Pick<HoldHour, 'temperatureC' | 'windKmh'>): number | null {
  if (hour.temperatureC === null || hour.windKmh === null) return null
  return computeWindChill(hour.temperatureC, hour.windKmh, 'metric').rounded
}

/** Which figure of a level an hour reaches, if any (wind first, then wind chill, then visibility). */
export function findHoldCause(level: HoldLevel, hour: HoldHour): { cause: HoldCause, value: number, limit: number } | null {
  if (level.windKmh != null && hour.windKmh !== null && hour.windKmh >= level.windKmh) return { cause: 'windKmh', value: hour.windKmh, limit: level.windKmh }
  const chill = level.windChillC != null ? hourWindChillC(hour) : null
  if (level.windChillC != null && chill !== null && chill <= level.windChillC) return { cause: 'windChillC', value: chill, limit: level.windChillC }
  if (level.visibilityM != null && hour.visibilityM !== null && hour.visibilityM <= level.visibilityM) return { cause: 'visibilityM', value: hour.visibilityM, limit: level.visibilityM }
  return null
}

/**
 * The hold over an outing [fromMs, toMs): the most severe level (levels come mildest first) reached in
 * any hour that overlaps it, the first such hour, and the figure that reached it; null when none is
 * reached or there are no hours.
 */
export function evaluateWeatherHold(levels: HoldLevel[], hours: HoldHour[], fromMs: number, toMs: number): WeatherHold | null {
  const inOuting = hours.filter(h => h.atMs < toMs && h.atMs + HOUR_MS > fromMs).sort((a, b) => a.atMs - b.atMs)
  for (let i = levels.length - 1; i >= 0; i--) {
    const level = levels[i]!
    for (const hour of inOuting) {
      const found = findHoldCause(level, hour)
      if (found) return { level: level.name, atMs: hour.atMs, cause: found.cause, advice: level.advice, value: found.value, limit: found.limit }
    }
  }
  return null
}
