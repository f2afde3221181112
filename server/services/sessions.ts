// Server-side sessions. The sealed cookie holds a random session id (in its `secure` part, never sent
// to the page); the database keeps only the id's SHA-256, the person and when it started and ended.
// Every request checks the row (server/utils/auth.ts), so ending it refuses that cookie at once,
// copies included. Sessions last as long as the cookie does (14 days), never longer.
// Explicit imports only, so unit tests can run it.
import { createHash, randomBytes } from 'node:crypto'
import { and, eq, gt, isNull, lt, ne } from 'drizzle-orm'
import { sessions } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { nowDate, nowMs } from '../core/time/clock'

export const SESSION_MAX_AGE_MS = 14 * 86_400_000

type Writer = Pick<AppDatabase, 'insert' | 'update' | 'delete'>

/** The stored form of a session id: SHA-256, hex. */
export function hashSessionId(sid: string): string {
  return createHash('sha256').update(sid).digest('hex')
}

/** Starts a session for a person; returns the id to seal into the cookie. Old ended rows are swept. */
export function openPersonSession(db: Writer, personId: number): string {
  const sid = randomBytes(32).toString('base64url')
  const now = nowMs()
  db.delete(sessions).where(lt(sessions.createdAt, new Date(now - SESSION_MAX_AGE_MS))).run()
  db.insert(sessions).values({ idHash: hashSessionId(sid), personId, createdAt: new Date(now) }).run()
  return sid
}

/** True when this id names a live session of this person (not ended, not older than the cookie). */
export function isLiveSession(db: Pick<AppDatabase, 'select'>, personId: number, sid: string): boolean {
  const row = db.select({ personId: sessions.personId, createdAt: sessions.createdAt, endedAt: sessions.endedAt })
    .from(sessions).where(eq(sessions.idHash, hashSessionId(sid))).get()
  return Boolean(row && row.personId === personId && !row.endedAt && row.createdAt.getTime() > nowMs() - SESSION_MAX_AGE_MS)
}

/** Ends one session (sign-out). */
export function endSession(db: Writer, sid: string) {
  db.update(sessions).set({ endedAt: nowDate() }).where(and(eq(sessions.idHash, hashSessionId(sid)), isNull(sessions.endedAt))).run()
}

/** Ends every session of a person, or every one but `keepSid`; returns how many were ended. */
export function endPersonSessions(db: Writer, personId: number, keepSid?: string): number {
  const keep = keepSid ? ne(sessions.idHash, hashSessionId(keepSid)) : undefined
  return db.update(sessions).set({ endedAt: nowDate() })
    .where(and(eq(sessions.personId, personId), isNull(sessions.endedAt), keep)).run().changes
}

/** Counts a person's live sessions (for the settings page). */
export function countLiveSessions(db: Pick<AppDatabase, 'select'>, personId: number): number {
  return db.select({ idHash: sessions.idHash }).from(sessions)
    .where(and(eq(sessions.personId, personId), isNull(sessions.endedAt), gt(sessions.createdAt, new Date(nowMs() - SESSION_MAX_AGE_MS))))
    .all().length
}
