import { z } from 'zod'
import { LatitudeSchema, LongitudeSchema, TimeZoneSchema } from '../../utils/validation'
import { describeZoneSolarGap, suggestTimeZone } from '../../core/time/zone-suggest'

const QuerySchema = z.object({
  lat: LatitudeSchema,
  lon: LongitudeSchema,
  // the zone the coordinator picked instead of the suggestion: the warning is for that zone
  tz: TimeZoneSchema.optional()
})

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { lat, lon, tz } = readQueryAs(event, QuerySchema)
  const suggestion = suggestTimeZone(lat, lon)
  if (!tz) return suggestion
  return { ...describeZoneSolarGap(tz, lon), candidates: suggestion.candidates }
})
