import { useDB } from '../utils/db'
import { asc, eq, sql } from 'drizzle-orm'
import { people } from '../db/schema'
import { nowDate } from '../core/time/clock'
import { endPersonSessions } from './sessions'
import { recordAudit } from './audit'

// a valid scrypt hash of a random string, used to spend the same time on unknown e-mails
export const DUMMY_PASSWORD_HASH = '$scrypt$n=16384,r=8,p=1$3eWmVt4zX6V1VC6v4FhAiw$DCtUVGpjEjYECwrRWKqC67RCtUlYCPYRP52gEoD1D/7vlaE1MKWK50KAWmZLBMR5/xdHwQxkVCilfYvGU3piZg'

/** Finds a person by e-mail (already lower-cased). */
export function findPersonByEmail(email: string) {
  return useDB().select().from(people).where(eq(people.email, email)).get()
}

/** Finds a person by id, with the password hash (for a change of password). */
export function findPersonById(id: number) {
  return useDB().select().from(people).where(eq(people.id, id)).get()
}

/** Stores a new password hash (a rehash on sign-in); sessions stay as they are. */
export function updatePasswordHash(personId: number, passwordHash: string) {
  useDB().update(people).set({ passwordHash, updatedAt: nowDate() }).where(eq(people.id, personId)).run()
}

/** A person changed their own password: store it and end every other session of theirs. */
export function changeOwnPassword(personId: number, passwordHash: string, keepSid: string) {
  useDB().transaction((tx) => {
    tx.update(people).set({ passwordHash, updatedAt: nowDate() }).where(eq(people.id, personId)).run()
    endPersonSessions(tx, personId, keepSid)
    recordAudit(tx, personId, 'password.change', 'person', personId, {})
  })
}

const PUBLIC_COLUMNS = {
  id: people.id,
  name: people.name,
  email: people.email,
  role: people.role,
  active: people.active,
  // has never chosen a password: added or invited, waiting for the first sign-in
  pending: sql<number>`${people.passwordHash} is null`
}

export interface PersonPublic { id: number, name: string, email: string | null, role: 'coordinator' | 'safety' | 'crew', active: boolean, pending: boolean }

// Crew see their colleagues' names and roles, not their e-mail addresses or account state.
function shapeFor<T extends { id: number, email: string, pending: number }>(row: T, viewer: { id: number, role: string }): PersonPublic {
  const shaped = { ...row, pending: Boolean(row.pending) } as unknown as PersonPublic
  if (viewer.role === 'crew' && viewer.id !== row.id) shaped.email = null
  return shaped
}

/** People as GET /api/people lists them, shaped for who is asking. */
export function listPeople(viewer: { id: number, role: string } = { id: 0, role: 'coordinator' }): PersonPublic[] {
  return useDB().select(PUBLIC_COLUMNS).from(people).orderBy(asc(people.name)).all().map(r => shapeFor(r, viewer))
}

/** One person as GET /api/people/:id shows them, shaped for who is asking. */
export function findPersonPublic(id: number, viewer: { id: number, role: string } = { id: 0, role: 'coordinator' }): PersonPublic | undefined {
  const row = useDB().select(PUBLIC_COLUMNS).from(people).where(eq(people.id, id)).get()
  return row && shapeFor(row, viewer)
}
