import { z } from 'zod'

const BodySchema = z.object({ token: z.string().trim().min(1, 'required').max(200) }).strict()

// Public (the token is the credential): tells the welcome page whose invitation a link is, or why it
// cannot be used. It reveals only the invited name, e-mail and role, to whoever holds the link.
export default defineEventHandler(async (event) => {
  const { token } = await readBodyAs(event, BodySchema)
  const { invitation, person } = requireUsableInvitation(useDB(), token)
  return { name: person.name, email: person.email, role: person.role, expiresAt: invitation.expiresAt.toISOString() }
})
