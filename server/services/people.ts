import { useDB } from '../utils/db'
import { and, asc, eq, gte, sql } from 'drizzle-orm'
import { loginAttempts, people } from '../db/schema'
import { nowDate, nowMs } from '../core/time/clock'

export const LOGIN_MAX_FAILURES = 10
export const LOGIN_WINDOW_MS = 15 * 60 * 1000
// a valid scrypt hash of a random string, used to spend the same time on unknown e-mails
export const DUMMY_PASSWORD_HASH = '$scrypt$n=16384,r=8,p=1$3eWmVt4zX6V1VC6v4FhAiw$DCtUVGpjEjYECwrRWKqC67RCtUlYCPYRP52gEoD1D/7vlaE1MKWK50KAWmZLBMR5/xdHwQxkVCilfYvGU3piZg'

/** Finds a person by e-mail (already lower-cased). */
export function findPersonByEmail(email: string) {
  return useDB().select().from(people).where(eq(people.email, email)).get()
}

/** Failed sign-ins for this e-mail inside the window; kept in the database so a restart does not reset it. */
export function countRecentLoginFailures(email: string, now = nowMs()) {
  const row = useDB().select({ n: sql<number>`count(*)` }).from(loginAttempts)
    .where(and(eq(loginAttempts.email, email), gte(loginAttempts.at, new Date(now - LOGIN_WINDOW_MS)))).get()
  return row?.n ?? 0
}

export function recordLoginFailure(email: string) {
  useDB().insert(loginAttempts).values({ email, at: nowDate() }).run()
}

export function clearLoginFailures(email: string) {
  useDB().delete(loginAttempts).where(eq(loginAttempts.email, email)).run()
}

export function updatePasswordHash(personId: number, passwordHash: string) {
  useDB().update(people).set({ passwordHash, updatedAt: nowDate() }).where(eq(people.id, personId)).run()
}

/** The public view of a person, as GET /api/people lists them. */
export function listPeople() {
  return useDB().select({ id: people.id, name: people.name, email: people.email, role: people.role, active: people.active })
    .from(people).orderBy(asc(people.name)).all()
}

export function findPersonPublic(id: number) {
  return useDB().select({ id: people.id, name: people.name, email: people.email, role: people.role, active: people.active })
    .from(people).where(eq(people.id, id)).get()
}
