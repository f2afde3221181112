import { eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { people } from '../db/schema'
import { endSession, isLiveSession, openPersonSession } from '../services/sessions'
import { findPasswordProblem } from '../core/accounts/password-policy'

export type Role = User['role']

function signInFirst() {
  return createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in first' })
}

/** The session id sealed in this request's cookie, if any. */
export async function readSessionId(event: H3Event): Promise<string | null> {
  const session = await getUserSession(event)
  return typeof session.secure?.sid === 'string' ? session.secure.sid : null
}

/**
 * Requires a signed-in, still active person with one of the given roles (any role when none given).
 * The cookie alone is trusted for nothing: its session id must name a live session of that person in
 * the database (so sign-out, a new password or deactivation refuse every copy of the cookie at once),
 * and the role is read again, so a changed role takes effect on the next request.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const session = await getUserSession(event)
  const sid = session.secure?.sid
  if (!session.user || typeof sid !== 'string') {
    if (session.user) await clearUserSession(event)
    throw signInFirst()
  }
  const db = useDB()
  const person = db.select({ id: people.id, email: people.email, name: people.name, role: people.role, active: people.active })
    .from(people).where(eq(people.id, session.user.id)).get()
  if (!person || !person.active || !isLiveSession(db, person.id, sid)) {
    await clearUserSession(event)
    throw signInFirst()
  }
  if (roles.length && !roles.includes(person.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role` })
  }
  return { id: person.id, email: person.email, name: person.name, role: person.role }
}

/** Requires a live session of any role, and gives its id too (for routes that end or keep it). */
export async function requireSession(event: H3Event): Promise<{ user: User, sid: string }> {
  const user = await requireRole(event)
  return { user, sid: (await readSessionId(event))! }
}

/** Signs a person in on this browser: a new server-side session and a fresh cookie. */
export async function startPersonSession(event: H3Event, person: { id: number, email: string, name: string, role: Role }): Promise<User> {
  const previous = await readSessionId(event)
  const db = useDB()
  if (previous) endSession(db, previous)
  const sid = openPersonSession(db, person.id)
  const user = { id: person.id, email: person.email, name: person.name, role: person.role }
  await replaceUserSession(event, { user, loggedInAt: nowMs(), secure: { sid } })
  return user
}

/** The server secret (the session password): seals one-time links in stored mail. */
export function readSessionSecret(): string {
  return String(useRuntimeConfig().session?.password ?? '')
}

/** Signs this browser out: its server-side session ends (every copy of the cookie with it). */
export async function endCurrentSession(event: H3Event) {
  const sid = await readSessionId(event)
  // the cookie goes first: if storage refuses the write (read-only mode), this browser is still out
  await clearUserSession(event)
  if (sid) endSession(useDB(), sid)
}

/** Refuses a chosen password that breaks the password rules, with a 400 naming the field. */
export function requireAcceptablePassword(password: string, email: string, field = 'password') {
  const problem = findPasswordProblem(password, email)
  if (problem) throw fieldError(field, problem)
}
