import { z } from 'zod'
import { findPasswordProblem } from '../../core/accounts/password-policy'

const BodySchema = z.object({
  token: z.string().trim().min(1, 'required').max(200),
  password: z.string({ error: 'required' }).max(512)
}).strict()

// Accepts an invitation: sets the password, activates the account, spends the token, signs in.
export default defineEventHandler(async (event) => {
  const { token, password } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const { person } = requireUsableInvitation(db, token)
  const problem = findPasswordProblem(password, person.email)
  if (problem) throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: `Invalid password: ${problem}`, data: { issues: [{ field: 'password', message: problem }] } })
  const updated = acceptInvitation(db, token, await hashPassword(password))
  const user = { id: updated.id, email: updated.email, name: updated.name, role: updated.role }
  await setUserSession(event, { user, loggedInAt: nowMs() })
  return { user }
})
