import { z } from 'zod'
import { DEFAULT_MIN_CIVIL_HOURS } from '../../../../shared/light'
import { IdParamsSchema, LocalDateSchema, numberBetween } from '../../../utils/validation'
import { computeRunup } from '../../../core/light/runup'
import { localDateOf } from '../../../core/time/zoned'

const QuerySchema = z.object({
  minCivilHours: numberBetween(0.25, 24).optional(),
  // the date to count from; today at the site when absent
  // the run-up looks 190 days back and 400 ahead, inside the engine's 1901–2149
  from: LocalDateSchema.refine(d => d >= '1902-01-01' && d <= '2147-12-31', 'must be between 1902-01-01 and 2147-12-31').optional()
})

// The run-up to (or out of) polar night: days left with N hours of civil light and the dates that matter.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const q = readQueryAs(event, QuerySchema)
  const site = requireSite(id)
  return computeRunup({
    siteId: site.id, latitude: site.latitude, longitude: site.longitude, timezone: site.timezone,
    from: q.from ?? localDateOf(nowMs(), site.timezone),
    minCivilHours: q.minCivilHours ?? DEFAULT_MIN_CIVIL_HOURS
  })
})
