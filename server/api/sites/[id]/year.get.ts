import { z } from 'zod'
import { IdParamsSchema } from '../../../utils/validation'
import { computeYearChart } from '../../../core/light/year-chart'
import { localDateOf } from '../../../core/time/zoned'
import { FIRST_YEAR, LAST_YEAR, YEAR_RANGE_MESSAGE } from '../../../../shared/schemas/calendar'

const QuerySchema = z.object({
  // the product's years, inside the light engine's (shared/schemas/calendar.ts)
  year: z.string().trim().regex(/^\d{4}$/, 'expected a year as four digits').transform(Number)
    .pipe(z.number().int().min(FIRST_YEAR, YEAR_RANGE_MESSAGE).max(LAST_YEAR, YEAR_RANGE_MESSAGE)).optional()
})

// The whole year's light at a site, day by day, for the year chart (the current local year by default).
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const q = readQueryAs(event, QuerySchema)
  const site = requireSite(id)
  const year = q.year ?? Number(localDateOf(nowMs(), site.timezone).slice(0, 4))
  return computeYearChart({ siteId: site.id, latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, year })
})
