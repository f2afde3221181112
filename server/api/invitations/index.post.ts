import { z } from 'zod'
import { EmailSchema, PersonNameSchema, RoleSchema } from '../../utils/validation'

const BodySchema = z.object({
  name: PersonNameSchema,
  email: EmailSchema,
  role: RoleSchema
}).strict()

// Invites a person by e-mail with a role: an inactive account and a one-time link (72 h) by mail.
// The mail goes out at once; if the SMTP server is down it stays in the outbox and is retried.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, BodySchema)
  const db = useDB()
  const baseUrl = resolvePublicBaseUrl(event)!
  const { invitation, person, messageId } = createInvitation(db, actor, body, { baseUrl, secret: readSessionSecret() })
  const delivery = await deliverOutboxMessage(db, messageId)
  setResponseStatus(event, 201)
  return {
    invitation: { id: invitation.id, expiresAt: invitation.expiresAt.toISOString() },
    person: { id: person.id, name: person.name, email: person.email, role: person.role, active: person.active },
    mail: { messageId, status: delivery.status === 'sent' ? 'sent' : 'queued-for-retry' }
  }
})
