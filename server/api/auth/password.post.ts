import { z } from 'zod'

const BodySchema = z.object({
  currentPassword: z.string({ error: 'required' }).min(1, 'required').max(512),
  newPassword: z.string({ error: 'required' }).max(512)
}).strict()

// A signed-in person changes their password: the current one is checked (and counted like a sign-in,
// so a borrowed session cannot guess it), every other session of theirs ends, this one goes on.
export default defineEventHandler(async (event) => {
  const { user, sid } = await requireSession(event)
  const { currentPassword, newPassword } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const verdict = chargeSignInAttempt(db, user.email, getRequestIP(event) ?? 'unknown', nowMs())
  if (!verdict.allowed) throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: 'Too many wrong passwords. Wait a while and try again.' })
  const person = findPersonById(user.id)!
  if (!person.passwordHash || !(await verifyPassword(person.passwordHash, currentPassword))) {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'Invalid currentPassword: not your current password', data: { issues: [{ field: 'currentPassword', message: 'not your current password' }] } })
  }
  refundSignInAttempt(db, verdict.charge)
  requireAcceptablePassword(newPassword, person.email, 'newPassword')
  changeOwnPassword(person.id, await hashPassword(newPassword), sid)
  return { ok: true }
})
