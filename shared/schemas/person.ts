// The bodies of POST /api/people and PATCH /api/people/:id: the handlers validate with them, and the
// add-person form checks its fields with the same schema before sending.
import { z } from 'zod'
import { EmailSchema, PersonNameSchema, RoleSchema, TimeZoneSchema } from './fields'

export const PersonBodySchema = z.object({
  name: PersonNameSchema,
  email: EmailSchema,
  role: RoleSchema
})
export type PersonInput = z.infer<typeof PersonBodySchema>

export const PersonPatchSchema = z.object({
  name: PersonNameSchema.optional(),
  role: RoleSchema.optional(),
  active: z.boolean({ error: 'must be true or false' }).optional(),
  // whole days away are read in the person's own zone: this one, else their home site's, else UTC
  timezone: TimeZoneSchema.nullable().optional(),
  homeSiteId: z.number({ error: 'expected a site id' }).int('expected a site id').positive('expected a site id').nullable().optional()
}).strict()
export type PersonPatch = z.infer<typeof PersonPatchSchema>
