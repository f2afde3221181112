// One-time password links. An invitation (a new person, or someone a coordinator added by form or
// import) lets them choose a first password; a reset (asked for on the sign-in page, or sent by a
// coordinator) lets an active person choose a new one. Both are rows in `invitations` with a purpose:
// only the SHA-256 of the link's token is stored, an invitation works for 72 hours and a reset for
// one hour, each works once, and a new link of a person retires that person's earlier open ones.
// The mail's stored body shows a placeholder; the link is kept sealed until it is sent (mail-links.ts).
// Setting a password through a link ends every other session of that person.
// Explicit imports only, so unit tests can run it.
import { createHash, randomBytes } from 'node:crypto'
import { createError } from 'h3'
import { and, desc, eq, gt, isNull } from 'drizzle-orm'
import { invitations, people, type Person } from '../db/schema'
import { formatDate, formatLocalTime } from '../../shared/format'
import { renderInvitationMail } from '../../emails/invitation'
import { renderPasswordResetMail } from '../../emails/password-reset'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { enqueueOutboxMessage } from './outbox'
import { LINK_PLACEHOLDER, sealMailLink } from './mail-links'
import { endPersonSessions } from './sessions'
import { clearAccountSignInLimit } from './sign-in-limits'
import { nowMs as clockNowMs } from '../core/time/clock'

export const INVITATION_TTL_MS = 72 * 3_600_000
export const RESET_TTL_MS = 3_600_000
export const INVITATION_KIND = 'invitation'
export const RESET_KIND = 'password-reset'
// at most this many reset links a person can ask for in an hour (the sign-in page is public)
export const RESET_REQUESTS_PER_HOUR = 3

export type LinkPurpose = 'invitation' | 'reset'
type Tx = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]

const ROLE_WORDS: Record<Person['role'], string> = {
  coordinator: 'a coordinator (plans sites, crews and shifts)',
  safety: 'a safety officer (reviews work in dark hours and the cold)',
  crew: 'a crew member (sees your shifts and the light at your sites)'
}

/** The stored form of a link token: SHA-256, hex. */
export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

function inputError(status: number, field: string, message: string, sentence: string) {
  return createError({ statusCode: status, statusMessage: status === 409 ? 'Conflict' : status === 410 ? 'Gone' : 'Bad Request', message: sentence, data: { issues: [{ field, message }] } })
}

function expiresWords(expiresAt: Date) {
  return `${formatDate(expiresAt.toISOString().slice(0, 10))} ${formatLocalTime(expiresAt, 'UTC')} UTC`
}

export interface LinkOptions { baseUrl: string, secret: string, nowMs?: number }

/**
 * Issues a one-time link for a person and queues its mail, inside the caller's transaction.
 * The person's earlier open links stop working. `actor` is null when the person asked themselves.
 */
export function issuePasswordLink(tx: Tx, person: Person, purpose: LinkPurpose, actor: { id: number, name: string } | null, options: LinkOptions) {
  const nowMs = options.nowMs ?? clockNowMs()
  const token = randomBytes(32).toString('base64url')
  const expiresAt = new Date(nowMs + (purpose === 'reset' ? RESET_TTL_MS : INVITATION_TTL_MS))
  tx.update(invitations).set({ expiresAt: new Date(nowMs) }).where(and(eq(invitations.personId, person.id), isNull(invitations.usedAt), gt(invitations.expiresAt, new Date(nowMs)))).run()
  const invitation = tx.insert(invitations).values({ personId: person.id, tokenHash: hashInvitationToken(token), expiresAt, purpose, createdBy: actor?.id ?? null, createdAt: new Date(nowMs) }).returning().get()
  const link = `${options.baseUrl}/${purpose === 'reset' ? 'reset' : 'welcome'}?token=${encodeURIComponent(token)}`
  const mail = purpose === 'reset'
    ? renderPasswordResetMail({ personName: person.name, senderName: actor?.name ?? null, link: LINK_PLACEHOLDER, expiresText: expiresWords(expiresAt) })
    : renderInvitationMail({ personName: person.name, inviterName: actor?.name ?? 'Your coordinator', roleWords: ROLE_WORDS[person.role], link: LINK_PLACEHOLDER, expiresText: expiresWords(expiresAt) })
  const kind = purpose === 'reset' ? RESET_KIND : INVITATION_KIND
  const message = enqueueOutboxMessage(tx, { ...mail, dedupeKey: `${kind}:${invitation.id}`, kind, personId: person.id, toEmail: person.email, meta: { invitationId: invitation.id, role: person.role, sealedLink: sealMailLink(link, options.secret) } })
  recordAudit(tx, actor?.id ?? person.id, `${kind}.send`, 'person', person.id, { invitationId: invitation.id })
  return { invitation, messageId: message.id }
}

export interface InvitationInput { name: string, email: string, role: Person['role'] }

/**
 * Creates (or, for a person who has never set a password or was deactivated, renews) an invitation
 * and queues its mail, in one transaction. Someone active with a password is refused with 409.
 */
export function createInvitation(db: AppDatabase, actor: { id: number, name: string }, input: InvitationInput, options: LinkOptions) {
  const nowMs = options.nowMs ?? clockNowMs()
  return db.transaction((tx) => {
    const existing = tx.select().from(people).where(eq(people.email, input.email)).get()
    if (existing?.active && existing.passwordHash) throw inputError(409, 'email', 'already an active account', `${input.email} already has an active account: they can sign in, or you can send them a password reset from the people page.`)
    const person = existing
      ? tx.update(people).set({ name: input.name, role: input.role, updatedAt: new Date(nowMs) }).where(eq(people.id, existing.id)).returning().get()
      : tx.insert(people).values({ name: input.name, email: input.email, role: input.role, active: false }).returning().get()
    const { invitation, messageId } = issuePasswordLink(tx, person, 'invitation', actor, { ...options, nowMs })
    recordAudit(tx, actor.id, existing ? 'invitation.renew' : 'invitation.create', 'person', person.id, { invitationId: invitation.id, role: person.role, email: person.email })
    return { invitation, person, messageId }
  })
}

/**
 * A coordinator's "send a link": a person who has never chosen a password gets the invitation again,
 * an active person with a password gets a reset link. A deactivated person is refused (reactivate first).
 */
export function sendPasswordLinkTo(db: AppDatabase, actor: { id: number, name: string }, personId: number, options: LinkOptions) {
  return db.transaction((tx) => {
    const person = tx.select().from(people).where(eq(people.id, personId)).get()
    if (!person) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: 'Person not found' })
    if (person.passwordHash && !person.active) throw inputError(409, 'active', 'deactivated', `${person.name} is deactivated: reactivate them first.`)
    const purpose: LinkPurpose = person.passwordHash ? 'reset' : 'invitation'
    return { person, purpose, ...issuePasswordLink(tx, person, purpose, actor, options) }
  })
}

/** Sends set-password invitations to people just added (by form or import), in the caller's transaction. */
export function invitePeopleAdded(tx: Tx, actor: { id: number, name: string }, personIds: number[], options: LinkOptions): number[] {
  const messageIds: number[] = []
  for (const id of personIds) {
    const person = tx.select().from(people).where(eq(people.id, id)).get()
    if (person && !person.passwordHash) messageIds.push(issuePasswordLink(tx, person, 'invitation', actor, options).messageId)
  }
  return messageIds
}

/**
 * "Forgot your password?": a reset link for a known, active person, quietly nothing otherwise (the
 * reply is the same either way). A person who never set a password gets their invitation again.
 * Returns the queued message id, or null.
 */
export function requestPasswordReset(db: AppDatabase, email: string, options: LinkOptions): number | null {
  const nowMs = options.nowMs ?? clockNowMs()
  return db.transaction((tx) => {
    const person = tx.select().from(people).where(eq(people.email, email)).get()
    if (!person || (!person.active && person.passwordHash)) return null
    const recent = tx.select({ id: invitations.id }).from(invitations)
      .where(and(eq(invitations.personId, person.id), isNull(invitations.createdBy), gt(invitations.createdAt, new Date(nowMs - 3_600_000)))).all()
    if (recent.length >= RESET_REQUESTS_PER_HOUR) return null
    return issuePasswordLink(tx, person, person.passwordHash ? 'reset' : 'invitation', null, { ...options, nowMs }).messageId
  })
}

const WORDS: Record<LinkPurpose, { invalid: string, used: string, expired: string }> = {
  invitation: {
    invalid: 'This invitation link is not valid. Check that you copied the whole link, or ask your coordinator for a new one.',
    used: 'This invitation link has already been used. Sign in with the password you chose, or ask your coordinator for a new link.',
    expired: 'This invitation link has expired (links work for 72 hours). Ask your coordinator for a new one.'
  },
  reset: {
    invalid: 'This password link is not valid. Check that you copied the whole link, or ask for a new one on the sign-in page.',
    used: 'This password link has already been used. Sign in with your new password, or ask for a new link.',
    expired: 'This password link has expired (links work for one hour). Ask for a new one on the sign-in page.'
  }
}

/** Finds the link of a token for a purpose and says plainly why it cannot be used. */
export function requireUsableLink(db: Pick<AppDatabase, 'select'>, token: string, purpose: LinkPurpose, nowMs = clockNowMs()) {
  const found = db.select().from(invitations).where(eq(invitations.tokenHash, hashInvitationToken(token))).get()
  if (!found || found.purpose !== purpose) throw inputError(400, 'token', 'not a valid link', WORDS[purpose].invalid)
  if (found.usedAt) throw inputError(410, 'token', 'already used', WORDS[purpose].used)
  if (found.expiresAt.getTime() <= nowMs) throw inputError(410, 'token', 'expired', WORDS[purpose].expired)
  const person = db.select().from(people).where(eq(people.id, found.personId)).get()!
  if (purpose === 'invitation' && person.active && person.passwordHash) throw inputError(409, 'token', 'account already active', 'This account is already active. Sign in with your password.')
  if (purpose === 'reset' && !person.active) throw inputError(410, 'token', 'account deactivated', 'This account is deactivated. Ask your coordinator.')
  return { invitation: found, person }
}

/** Finds the invitation of a token and says plainly why it cannot be used. */
export function requireUsableInvitation(db: Pick<AppDatabase, 'select'>, token: string, nowMs = clockNowMs()) {
  return requireUsableLink(db, token, 'invitation', nowMs)
}

/**
 * Spends a link: sets the password (and, for an invitation, activates the person), ends every session
 * of that person and lifts sign-in delays. A second use of the same token fails.
 */
export function spendPasswordLink(db: AppDatabase, token: string, purpose: LinkPurpose, passwordHash: string, nowMs = clockNowMs()): Person {
  return db.transaction((tx) => {
    const { invitation, person } = requireUsableLink(tx, token, purpose, nowMs)
    // the guard on usedAt makes the token single-use even if two requests race
    const spent = tx.update(invitations).set({ usedAt: new Date(nowMs) }).where(and(eq(invitations.id, invitation.id), isNull(invitations.usedAt))).run()
    if (spent.changes !== 1) throw inputError(410, 'token', 'already used', WORDS[purpose].used)
    const updated = tx.update(people).set({ passwordHash, active: true, updatedAt: new Date(nowMs) }).where(eq(people.id, person.id)).returning().get()
    endPersonSessions(tx, person.id)
    clearAccountSignInLimit(tx, person.email)
    recordAudit(tx, person.id, purpose === 'reset' ? 'password.reset' : 'invitation.accept', 'person', person.id, { invitationId: invitation.id })
    return updated
  })
}

/** Accepts an invitation (see spendPasswordLink). */
export function acceptInvitation(db: AppDatabase, token: string, passwordHash: string, nowMs = clockNowMs()): Person {
  return spendPasswordLink(db, token, 'invitation', passwordHash, nowMs)
}

/** Invitations, newest first, with their state (never the token). */
export function listInvitations(db: AppDatabase, nowMs = clockNowMs()) {
  return db.select({ id: invitations.id, personId: invitations.personId, name: people.name, email: people.email, role: people.role, expiresAt: invitations.expiresAt, usedAt: invitations.usedAt, createdAt: invitations.createdAt })
    .from(invitations).innerJoin(people, eq(people.id, invitations.personId)).where(eq(invitations.purpose, 'invitation')).orderBy(desc(invitations.id)).limit(200).all()
    .map(r => ({
      ...r,
      state: r.usedAt ? 'used' as const : r.expiresAt.getTime() <= nowMs ? 'expired' as const : 'open' as const,
      expiresAt: r.expiresAt.toISOString(),
      usedAt: r.usedAt?.toISOString() ?? null,
      createdAt: r.createdAt.toISOString()
    }))
}
