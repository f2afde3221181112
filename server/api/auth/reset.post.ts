import { z } from 'zod'

const BodySchema = z.object({
  token: z.string().trim().min(1, 'required').max(200),
  password: z.string({ error: 'required' }).max(512)
}).strict()

// Public (the token is the credential): sets a new password through a reset link, once, within an
// hour. Every other session of that person ends; this browser is signed in.
export default defineEventHandler(async (event) => {
  const { token, password } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const { person } = requireUsableLink(db, token, 'reset')
  requireAcceptablePassword(password, person.email)
  const updated = spendPasswordLink(db, token, 'reset', await hashPassword(password))
  return { user: await startPersonSession(event, updated) }
})
