import { z } from 'zod'
import { EmailSchema } from '../../utils/validation'

const BodySchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'required').max(512)
})

export default defineEventHandler(async (event) => {
  const { email, password } = await readBodyAs(event, BodySchema)
  const failures = countRecentLoginFailures(email)
  if (failures >= LOGIN_MAX_FAILURES) {
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: 'Too many failed sign-ins for this e-mail. Wait 15 minutes and try again.' })
  }
  const person = findPersonByEmail(email)
  // verify against a dummy hash when there is no such person, so timing does not reveal who exists
  const ok = await verifyPassword(person?.passwordHash || DUMMY_PASSWORD_HASH, password)
  if (!person || !person.active || !person.passwordHash || !ok) {
    recordLoginFailure(email)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Wrong e-mail or password' })
  }
  if (failures > 0) clearLoginFailures(email)
  if (passwordNeedsReHash(person.passwordHash)) updatePasswordHash(person.id, await hashPassword(password))
  const user = { id: person.id, email: person.email, name: person.name, role: person.role }
  await setUserSession(event, { user, loggedInAt: nowMs() })
  return { user }
})
