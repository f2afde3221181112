import { z } from 'zod'

const BodySchema = z.object({
  token: z.string().trim().min(1, 'required').max(200),
  password: z.string({ error: 'required' }).max(512)
}).strict()

// Accepts an invitation: sets the password, activates the account, spends the token, ends any other
// session of that person and signs this browser in.
export default defineEventHandler(async (event) => {
  const { token, password } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const { person } = requireUsableInvitation(db, token)
  requireAcceptablePassword(password, person.email)
  const updated = acceptInvitation(db, token, await hashPassword(password))
  return { user: await startPersonSession(event, updated) }
})
