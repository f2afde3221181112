import { z } from 'zod'
import { LatitudeSchema, LocalDateSchema, LongitudeSchema, TimeZoneSchema, numberBetween } from './validation'
import { FIRST_YEAR, LAST_YEAR, YEAR_RANGE_MESSAGE } from '../../shared/schemas/calendar'

export const MAX_LIGHT_RANGE_DAYS = 366

function daysBetween(from: string, to: string) {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000) + 1
}

const RangeShape = { from: LocalDateSchema, to: LocalDateSchema }

function checkRange(value: { from: string, to: string }, ctx: z.RefinementCtx) {
  if (value.from > value.to) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must not be before from' })
  else if (daysBetween(value.from, value.to) > MAX_LIGHT_RANGE_DAYS) ctx.addIssue({ code: 'custom', path: ['to'], message: `the range may span at most ${MAX_LIGHT_RANGE_DAYS} days` })
}

export const LightQuerySchema = z.object({ lat: LatitudeSchema, lon: LongitudeSchema, tz: TimeZoneSchema, ...RangeShape }).superRefine(checkRange)
export const SiteLightQuerySchema = z.object(RangeShape).superRefine(checkRange)

const YearSchema = z.union([z.number(), z.string().trim().regex(/^-?\d+$/, 'expected a whole year')], { error: 'expected a year' })
  .transform(Number).pipe(z.number().int().min(FIRST_YEAR, YEAR_RANGE_MESSAGE).max(LAST_YEAR, YEAR_RANGE_MESSAGE))
const MinCivilHoursSchema = numberBetween(0, 24).optional()

export const SeasonsQuerySchema = z.object({ lat: LatitudeSchema, lon: LongitudeSchema, tz: TimeZoneSchema, year: YearSchema, minCivilHours: MinCivilHoursSchema })
export const SiteSeasonsQuerySchema = z.object({ year: YearSchema, minCivilHours: MinCivilHoursSchema })
