// Invitations: a coordinator invites someone by e-mail with a role. The person is created inactive;
// the mail carries a one-time link. Only the SHA-256 of the link's token is stored, the link expires
// after 72 hours, and using it (setting a password) activates the person and spends the token.
// Explicit imports only, so unit tests can run it.
import { createHash, randomBytes } from 'node:crypto'
import { createError } from 'h3'
import { and, desc, eq, gt, isNull } from 'drizzle-orm'
import { invitations, people, type Person } from '../db/schema'
import { formatDate, formatLocalTime } from '../../shared/format'
import { renderInvitationMail } from '../../emails/invitation'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { enqueueOutboxMessage } from './outbox'
import { nowMs as clockNowMs } from '../core/time/clock'

export const INVITATION_TTL_MS = 72 * 3_600_000
export const INVITATION_KIND = 'invitation'

const ROLE_WORDS: Record<Person['role'], string> = {
  coordinator: 'a coordinator (plans sites, crews and shifts)',
  safety: 'a safety officer (reviews work in dark hours and the cold)',
  crew: 'a crew member (sees your shifts and the light at your sites)'
}

/** The stored form of an invitation token: SHA-256, hex. */
export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

function inputError(status: number, field: string, message: string, sentence: string) {
  return createError({ statusCode: status, statusMessage: status === 409 ? 'Conflict' : status === 410 ? 'Gone' : 'Bad Request', message: sentence, data: { issues: [{ field, message }] } })
}

export interface InvitationInput { name: string, email: string, role: Person['role'] }

/**
 * Creates (or, for an inactive person, renews) an invitation and queues its mail, in one transaction.
 * Earlier unused links of that person stop working. Someone already active is refused with 409.
 */
export function createInvitation(db: AppDatabase, actor: { id: number, name: string }, input: InvitationInput, options: { baseUrl: string, nowMs?: number }) {
  const nowMs = options.nowMs ?? clockNowMs()
  const token = randomBytes(32).toString('base64url')
  const expiresAt = new Date(nowMs + INVITATION_TTL_MS)
  return db.transaction((tx) => {
    const existing = tx.select().from(people).where(eq(people.email, input.email)).get()
    if (existing?.active) throw inputError(409, 'email', 'already an active account', `${input.email} already has an active account: they can sign in, or reset their password with a coordinator.`)
    const person = existing
      ? tx.update(people).set({ name: input.name, role: input.role, updatedAt: new Date(nowMs) }).where(eq(people.id, existing.id)).returning().get()
      : tx.insert(people).values({ name: input.name, email: input.email, role: input.role, active: false }).returning().get()
    tx.update(invitations).set({ expiresAt: new Date(nowMs) }).where(and(eq(invitations.personId, person.id), isNull(invitations.usedAt), gt(invitations.expiresAt, new Date(nowMs)))).run()
    const invitation = tx.insert(invitations).values({ personId: person.id, tokenHash: hashInvitationToken(token), expiresAt, createdBy: actor.id }).returning().get()
    const link = `${options.baseUrl}/welcome?token=${encodeURIComponent(token)}`
    const mail = renderInvitationMail({ personName: person.name, inviterName: actor.name, roleWords: ROLE_WORDS[person.role], link, expiresText: `${formatDate(expiresAt.toISOString().slice(0, 10))} ${formatLocalTime(expiresAt, 'UTC')} UTC` })
    const message = enqueueOutboxMessage(tx, { ...mail, dedupeKey: `${INVITATION_KIND}:${invitation.id}`, kind: INVITATION_KIND, personId: person.id, toEmail: person.email, meta: { invitationId: invitation.id, role: person.role } })
    recordAudit(tx, actor.id, existing ? 'invitation.renew' : 'invitation.create', 'person', person.id, { invitationId: invitation.id, role: person.role, email: person.email })
    return { invitation, person, messageId: message.id }
  })
}

/** Finds the invitation of a token and says plainly why it cannot be used (unknown, used, expired, already active). */
export function requireUsableInvitation(db: Pick<AppDatabase, 'select'>, token: string, nowMs = clockNowMs()) {
  const found = db.select().from(invitations).where(eq(invitations.tokenHash, hashInvitationToken(token))).get()
  if (!found) throw inputError(400, 'token', 'not a valid invitation link', 'This invitation link is not valid. Check that you copied the whole link, or ask your coordinator for a new one.')
  if (found.usedAt) throw inputError(410, 'token', 'already used', 'This invitation link has already been used. Sign in with the password you chose, or ask your coordinator for a new link.')
  if (found.expiresAt.getTime() <= nowMs) throw inputError(410, 'token', 'expired', 'This invitation link has expired (links work for 72 hours). Ask your coordinator for a new one.')
  const person = db.select().from(people).where(eq(people.id, found.personId)).get()!
  if (person.active) throw inputError(409, 'token', 'account already active', 'This account is already active. Sign in with your password.')
  return { invitation: found, person }
}

/** Spends the token: sets the password, activates the person; a second use of the same token fails. */
export function acceptInvitation(db: AppDatabase, token: string, passwordHash: string, nowMs = clockNowMs()): Person {
  return db.transaction((tx) => {
    const { invitation, person } = requireUsableInvitation(tx, token, nowMs)
    // the guard on usedAt makes the token single-use even if two requests race
    const spent = tx.update(invitations).set({ usedAt: new Date(nowMs) }).where(and(eq(invitations.id, invitation.id), isNull(invitations.usedAt))).run()
    if (spent.changes !== 1) throw inputError(410, 'token', 'already used', 'This invitation link has already been used.')
    const updated = tx.update(people).set({ passwordHash, active: true, updatedAt: new Date(nowMs) }).where(eq(people.id, person.id)).returning().get()
    recordAudit(tx, person.id, 'invitation.accept', 'person', person.id, { invitationId: invitation.id })
    return updated
  })
}

/** Invitations, newest first, with their state (never the token). */
export function listInvitations(db: AppDatabase, nowMs = clockNowMs()) {
  return db.select({ id: invitations.id, personId: invitations.personId, name: people.name, email: people.email, role: people.role, expiresAt: invitations.expiresAt, usedAt: invitations.usedAt, createdAt: invitations.createdAt })
    .from(invitations).innerJoin(people, eq(people.id, invitations.personId)).orderBy(desc(invitations.id)).limit(200).all()
    .map(r => ({
      ...r,
      state: r.usedAt ? 'used' as const : r.expiresAt.getTime() <= nowMs ? 'expired' as const : 'open' as const,
      expiresAt: r.expiresAt.toISOString(),
      usedAt: r.usedAt?.toISOString() ?? null,
      createdAt: r.createdAt.toISOString()
    }))
}
