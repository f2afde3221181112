// The bodies of POST /api/people and PATCH /api/people/:id: the handlers validate with them, and the
// add-person form checks its fields with the same schema before sending.
import { z } from 'zod'
import { EmailSchema, PersonNameSchema, RoleSchema } from './fields'

export const PersonBodySchema = z.object({
  name: PersonNameSchema,
  email: EmailSchema,
  role: RoleSchema
})
export type PersonInput = z.infer<typeof PersonBodySchema>

export const PersonPatchSchema = z.object({
  name: PersonNameSchema.optional(),
  role: RoleSchema.optional(),
  active: z.boolean({ error: 'must be true or false' }).optional()
}).strict()
export type PersonPatch = z.infer<typeof PersonPatchSchema>
