import { z } from 'zod'
import { people } from '../../db/schema'
import { EmailSchema, PersonNameSchema, RoleSchema } from '../../utils/validation'

const BodySchema = z.object({
  name: PersonNameSchema,
  email: EmailSchema,
  role: RoleSchema
})

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, BodySchema)
  if (findPersonByEmail(body.email)) {
    throw conflict('Someone with this e-mail already exists', { issues: [{ field: 'email', message: 'already in use' }] })
  }
  const db = useDB()
  const person = db.transaction((tx) => {
    const row = tx.insert(people).values(body).returning().get()
    recordAudit(tx, actor.id, 'person.create', 'person', row.id, { email: row.email, role: row.role })
    return row
  })
  setResponseStatus(event, 201)
  return { id: person.id, name: person.name, email: person.email, role: person.role, active: person.active }
})
