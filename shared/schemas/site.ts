// The body of POST /api/sites (and, every field optional, PATCH /api/sites/:id): the handlers
// validate with it, and the site form checks its fields with the same schema before sending.
import { z } from 'zod'
import { LatitudeSchema, LightRequirementSchema, LongitudeSchema, TimeZoneSchema, TravelMinutesSchema, singleLineText } from './fields'
import { MAX_NAME_LENGTH, MAX_NOTES_LENGTH } from './limits'

export const SiteBodySchema = z.object({
  name: singleLineText(MAX_NAME_LENGTH),
  latitude: LatitudeSchema,
  longitude: LongitudeSchema,
  timezone: TimeZoneSchema,
  elevation: z.number({ error: 'expected metres' }).min(-500, 'must be between -500 and 9000').max(9000, 'must be between -500 and 9000').nullable().optional(),
  defaultLight: LightRequirementSchema.optional(),
  reminderHour: z.number().int().min(0).max(23).optional(),
  // minutes of travel each way, the default for new shifts here
  travelMinutes: TravelMinutesSchema.optional(),
  notes: z.string().max(MAX_NOTES_LENGTH).optional()
})
export type SiteInput = z.infer<typeof SiteBodySchema>
