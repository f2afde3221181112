import { eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { people } from '../db/schema'

export type Role = User['role']

/**
 * Requires a signed-in, still active person with one of the given roles (any role when none given).
 * The session cookie alone is not trusted for the role: a deactivated person or a changed role
 * takes effect on the next request, not when the cookie expires.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const session = await getUserSession(event)
  if (!session.user) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in first' })
  const person = useDB().select({ id: people.id, email: people.email, name: people.name, role: people.role, active: people.active })
    .from(people).where(eq(people.id, session.user.id)).get()
  if (!person || !person.active) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in first' })
  }
  if (roles.length && !roles.includes(person.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role` })
  }
  return { id: person.id, email: person.email, name: person.name, role: person.role }
}
