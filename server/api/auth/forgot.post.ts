import { z } from 'zod'
import { EmailSchema } from '../../utils/validation'

const BodySchema = z.object({ email: EmailSchema }).strict()

const FORGOT_REPLY = 'If this address belongs to an active account, a link to choose a new password is on its way. It works for one hour.'

// Public. Answers the same for known and unknown addresses, and at the same pace: the mail is sent
// after the reply, never while the caller waits.
export default defineEventHandler(async (event) => {
  const { email } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const messageId = requestPasswordReset(db, email, { baseUrl: resolvePublicBaseUrl(event)!, secret: readSessionSecret() })
  if (messageId !== null) {
    const sending = deliverOutboxMessage(db, messageId).catch(() => undefined)
    event.waitUntil?.(sending)
  }
  setResponseStatus(event, 202)
  return { ok: true, message: FORGOT_REPLY }
})
