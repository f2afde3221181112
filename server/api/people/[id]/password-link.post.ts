import { IdParamsSchema } from '../../../utils/validation'

// A coordinator sends a person a one-time password link: the invitation again for someone who has
// not chosen a password yet, a reset link (1 h) for an active person who has.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const db = useDB()
  const sent = sendPasswordLinkTo(db, actor, id, { baseUrl: resolvePublicBaseUrl(event)!, secret: readSessionSecret() })
  const delivery = await deliverOutboxMessage(db, sent.messageId)
  setResponseStatus(event, 201)
  return {
    purpose: sent.purpose,
    expiresAt: sent.invitation.expiresAt.toISOString(),
    mail: { messageId: sent.messageId, status: delivery.status === 'sent' ? 'sent' : 'queued-for-retry' }
  }
})
