// Dates and times the product takes in: real calendar dates, real 24-hour wall-clock times, and only
// years inside the light engine's own range (LIGHT_FIRST_YEAR–LIGHT_LAST_YEAR, shared/light.ts). One
// range for every schema, so no date outside it ever reaches the engine. Pure: zod only.
import { z } from 'zod'
import { LIGHT_FIRST_YEAR, LIGHT_LAST_YEAR } from '../light'

/**
 * The years the product takes in: the engine's range less one year at each end, so everything
 * computed around an accepted date (the day before and after, the local day in any zone, a 90-day
 * slot window, a 366-day light range) stays inside what the engine answers for.
 */
export const FIRST_YEAR = LIGHT_FIRST_YEAR + 1
export const LAST_YEAR = LIGHT_LAST_YEAR - 1
export const YEAR_RANGE_MESSAGE = `must be in the years ${FIRST_YEAR} to ${LAST_YEAR}`

/** True for a whole year the product takes in. */
export function isSupportedYear(year: number): boolean {
  return Number.isInteger(year) && year >= FIRST_YEAR && year <= LAST_YEAR
}

/** True when year-month-day names a day on the (proleptic Gregorian) calendar: no 30 February, no month 13. */
export function isCalendarDate(year: number, month: number, day: number): boolean {
  if (!Number.isInteger(year) || !Number.isInteger(month) || !Number.isInteger(day) || month < 1 || month > 12 || day < 1) return false
  const date = new Date(0)
  date.setUTCFullYear(year, month - 1, day)
  return date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day
}

const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d{1,3})?)?)?(Z|[+-]\d{2}:?\d{2})?$/

/**
 * What is wrong with the calendar date, the 24-hour time and the offset of a date or date-time text
 * already in ISO 8601 shape, or null when they all exist: 2026-02-30, month 13, 24:00, 10:60, an
 * offset beyond ±18:00 and a year outside the engine's range are all refused.
 */
export function describeDateTimeProblem(text: string): string | null {
  const m = DATE_TIME.exec(text)
  if (!m) return null
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])]
  if (!isCalendarDate(year, month, day)) return 'no such date'
  if (m[4] !== undefined) {
    if (Number(m[4]) > 23) return 'no such time: hours run 00 to 23'
    if (Number(m[5]) > 59) return 'no such time: minutes run 00 to 59'
    if (m[6] !== undefined && Number(m[6]) > 59) return 'no such time: seconds run 00 to 59'
  }
  const offset = m[7]
  if (offset && offset !== 'Z') {
    const [h, min] = [Number(offset.slice(1, 3)), Number(offset.slice(-2))]
    if (min > 59 || h * 60 + min > 18 * 60) return 'no such offset: at most ±18:00'
  }
  if (!isSupportedYear(year)) return YEAR_RANGE_MESSAGE
  return null
}

/** Adds the calendar, clock and year checks to a schema for date or date-time text. */
export function realDateTime<T extends z.ZodType<string>>(schema: T) {
  return schema.superRefine((value, ctx) => {
    const problem = describeDateTimeProblem(value)
    if (problem) ctx.addIssue({ code: 'custom', message: problem })
  })
}

/** A wall-clock time YYYY-MM-DDTHH:mm[:ss] (read in a site's zone) that exists and is in range. */
export const WallClockTimeSchema = realDateTime(z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, 'expected a local time YYYY-MM-DDTHH:mm'))

/** A whole year the product takes in, from a number or a query string. */
export const SupportedYearSchema = z.coerce.number({ error: 'expected a year' }).int('expected a whole year')
  .min(FIRST_YEAR, YEAR_RANGE_MESSAGE).max(LAST_YEAR, YEAR_RANGE_MESSAGE)
