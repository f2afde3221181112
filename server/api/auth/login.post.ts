import { z } from 'zod'
import { EmailSchema } from '../../utils/validation'

const BodySchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'required').max(512)
})

// The attempt is charged to the account and the client address before the slow hash, atomically
// (server/services/sign-in-limits.ts); a correct password gives the charge back. When the charge
// cannot be written the sign-in is refused (storage errors answer 503): the limiter fails closed.
export default defineEventHandler(async (event) => {
  const { email, password } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const verdict = chargeSignInAttempt(db, email, getRequestIP(event) ?? 'unknown', nowMs())
  if (!verdict.allowed) {
    const seconds = Math.max(1, Math.ceil(verdict.retryAfterMs / 1000))
    setResponseHeader(event, 'Retry-After', seconds)
    const message = verdict.reason === 'address'
      ? `Too many failed sign-ins from this network. Try again in ${formatWait(seconds)}.`
      : `Too many failed sign-ins for this e-mail. Try again in ${formatWait(seconds)}, or choose a new password with “Forgot your password?”.`
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message, data: { retryAfterSeconds: seconds } })
  }
  const person = findPersonByEmail(email)
  // verify against a dummy hash when there is no such person, so timing does not reveal who exists
  const ok = await verifyPassword(person?.passwordHash || DUMMY_PASSWORD_HASH, password)
  if (!person || !person.active || !person.passwordHash || !ok) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Wrong e-mail or password' })
  }
  refundSignInAttempt(db, verdict.charge)
  if (passwordNeedsReHash(person.passwordHash)) updatePasswordHash(person.id, await hashPassword(password))
  return { user: await startPersonSession(event, person) }
})

function formatWait(seconds: number) {
  return seconds < 90 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`
}
