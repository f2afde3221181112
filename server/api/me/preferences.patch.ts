import { z } from 'zod'
import { TimeZoneSchema } from '../../utils/validation'

const BodySchema = z.object({
  remindersEnabled: z.boolean({ error: 'must be true or false' }).optional(),
  displayZone: z.union([z.literal('site'), TimeZoneSchema], { error: 'must be \'site\' or an IANA time zone name' }).optional(),
  feedIncludeSun: z.boolean({ error: 'must be true or false' }).optional(),
  units: z.enum(['metric', 'imperial'], { error: 'must be metric or imperial' }).optional()
}).strict()

// Changes the signed-in person's own preferences (only the fields given).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const changes = await readBodyAs(event, BodySchema)
  return updatePersonPreferences(useDB(), user.id, changes)
})
