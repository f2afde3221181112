// The outbox: every message is a row in `messages` before it is sent. The row's dedupeKey is unique
// (kind, person, date, shift set…), so a repeated run or a restart finds it and creates nothing new;
// delivery claims a row before sending, so two senders (the timer and a request) never both send it.
// A failed send stays in the table as `failed` with the error and the time of the next attempt
// (exponential back-off), and is sent once when the SMTP server is back.
import { and, desc, eq, inArray, isNotNull, isNull, lte, or, sql, type SQL } from 'drizzle-orm'
import { messages, people, type Message } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { useServerConfig } from '../utils/config'
import { sendMailMessage, type MailContent, type MailSender } from '../adapters/mail'
import { nowDate, nowMs as clockNowMs } from '../core/time/clock'
import { revealMailLink } from './mail-links'

export const OUTBOX_RETRY_BASE_MS = 60_000
export const OUTBOX_RETRY_MAX_MS = 60 * 60_000
// after this many failed attempts the timer stops retrying; a coordinator can still retry by hand
export const OUTBOX_MAX_ATTEMPTS = 12
// a claimed message is leased (messages.lease_until) for this long: longer than any SMTP timeout in
// mail.ts, so a slow send is never sent twice. Every sender respects an unexpired lease, a forced one
// ("send now", retry) too, in this process or another on the same database; if the holder dies
// mid-send, the message is sent again once the lease has run out.
export const OUTBOX_LEASE_MS = 5 * 60_000

// ids being sent right now by this process (the lease covers other processes and crashes)
const SENDING = new Set<number>()

export interface NewOutboxMessage extends MailContent {
  dedupeKey: string
  kind: string
  personId: number | null
  toEmail: string
  meta?: Record<string, unknown>
}

export interface DeliveryOutcome {
  id: number
  status: 'sent' | 'failed' | 'skipped'
  error?: string
}

/** The retry base delay, overridable with MAIL_RETRY_BASE_MS (tests use a short one). */
export function readRetryBaseMs(): number {
  return useServerConfig().mailRetryBaseMs ?? OUTBOX_RETRY_BASE_MS
}

/** Delay before attempt n + 1 after n failed attempts: base · 2^(n − 1), capped at one hour. */
export function computeRetryDelayMs(failedAttempts: number, baseMs = readRetryBaseMs()): number {
  const exponent = Math.max(0, Math.min(failedAttempts - 1, 30))
  return Math.min(baseMs * 2 ** exponent, Math.max(OUTBOX_RETRY_MAX_MS, baseMs))
}

/** Queues a message unless one with the same dedupeKey exists; returns its id and whether it is new. */
export function enqueueOutboxMessage(db: Pick<AppDatabase, 'insert' | 'select'>, message: NewOutboxMessage): { id: number, created: boolean } {
  const row = db.insert(messages).values({
    dedupeKey: message.dedupeKey,
    kind: message.kind,
    personId: message.personId,
    toEmail: message.toEmail,
    subject: message.subject,
    html: message.html,
    text: message.text,
    meta: message.meta ?? null,
    status: 'queued'
  }).onConflictDoNothing({ target: messages.dedupeKey }).returning({ id: messages.id }).get()
  if (row) return { id: row.id, created: true }
  const existing = db.select({ id: messages.id }).from(messages).where(eq(messages.dedupeKey, message.dedupeKey)).get()!
  return { id: existing.id, created: false }
}

/** True when a message with this dedupeKey exists already. */
export function hasOutboxMessage(db: Pick<AppDatabase, 'select'>, dedupeKey: string): boolean {
  return Boolean(db.select({ id: messages.id }).from(messages).where(eq(messages.dedupeKey, dedupeKey)).get())
}

// Nobody holds the message: never leased, or the lease has run out.
function leaseFree(now: Date) {
  return or(isNull(messages.leaseUntil), lte(messages.leaseUntil, now))
}

// Not held by a sender, and queued (never tried, or its back-off is over) or failed with a retry due.
function dueCondition(nowMs: number) {
  const now = new Date(nowMs)
  return and(leaseFree(now), or(
    and(eq(messages.status, 'queued'), or(isNull(messages.nextAttemptAt), lte(messages.nextAttemptAt, now))),
    and(eq(messages.status, 'failed'), isNotNull(messages.nextAttemptAt), lte(messages.nextAttemptAt, now))
  ))
}

// Takes the message for this sender: one UPDATE sets the lease only where nobody holds one, so of two
// senders (two processes on one database included) only one matches and sends. `force` skips the
// back-off, never a lease.
function claimMessage(db: AppDatabase, id: number, nowMs: number, force: boolean): Message | undefined {
  const due = force ? and(inArray(messages.status, ['queued', 'failed']), leaseFree(new Date(nowMs))) : dueCondition(nowMs)
  return db.update(messages).set({ leaseUntil: new Date(nowMs + OUTBOX_LEASE_MS) })
    .where(and(eq(messages.id, id), due)).returning().get()
}

/**
 * Sends one queued or failed message if it is due (or `force`), records sent or failed.
 * A message someone else is sending, or one already sent, is skipped.
 */
export async function deliverOutboxMessage(db: AppDatabase, id: number, options: { nowMs?: number, force?: boolean, send?: MailSender } = {}): Promise<DeliveryOutcome> {
  const nowMs = options.nowMs ?? clockNowMs()
  // `force` skips the back-off but never a send in progress in this process
  if (SENDING.has(id)) return { id, status: 'skipped' }
  const row = claimMessage(db, id, nowMs, options.force ?? false)
  if (!row) return { id, status: 'skipped' }
  const send = options.send ?? sendMailMessage
  SENDING.add(id)
  try {
    // a one-time link is stored sealed and put into the body only now (mail-links.ts)
    await send({ to: row.toEmail, subject: row.subject, ...revealMailLink(row) })
    db.update(messages).set({ status: 'sent', attempts: row.attempts + 1, sentAt: nowDate(), lastError: null, nextAttemptAt: null, leaseUntil: null })
      .where(eq(messages.id, id)).run()
    return { id, status: 'sent' }
  } catch (err) {
    const attempts = row.attempts + 1
    const error = describeSendError(err)
    const next = attempts >= OUTBOX_MAX_ATTEMPTS ? null : new Date(nowMs + computeRetryDelayMs(attempts))
    db.update(messages).set({ status: 'failed', attempts, lastError: error, nextAttemptAt: next, leaseUntil: null }).where(eq(messages.id, id)).run()
    return { id, status: 'failed', error }
  } finally {
    SENDING.delete(id)
  }
}

function describeSendError(err: unknown): string {
  const e = err as { code?: string, message?: string, response?: string }
  const text = [e?.code, e?.response ?? e?.message].filter(Boolean).join(': ')
  return (text || String(err)).slice(0, 500)
}

/** Ids of messages waiting to be sent whose time has come (queued, or failed with a retry due). */
export function findDueOutboxIds(db: AppDatabase, nowMs: number, limit = 200): number[] {
  return db.select({ id: messages.id }).from(messages).where(dueCondition(nowMs)).orderBy(messages.id).limit(limit).all().map(r => r.id)
}

/** Sends, one after another, every message that is due; returns what happened to each. */
export async function deliverDueOutboxMessages(db: AppDatabase, nowMs = clockNowMs(), send?: MailSender): Promise<DeliveryOutcome[]> {
  const outcomes: DeliveryOutcome[] = []
  for (const id of findDueOutboxIds(db, nowMs)) outcomes.push(await deliverOutboxMessage(db, id, { nowMs, send }))
  return outcomes
}

/** Retries failed messages now (all, or the given ids), ignoring back-off and the attempt limit. */
export async function retryFailedOutboxMessages(db: AppDatabase, ids?: number[], send?: MailSender): Promise<DeliveryOutcome[]> {
  const where = ids?.length ? and(eq(messages.status, 'failed'), inArray(messages.id, ids)) : eq(messages.status, 'failed')
  const failed = db.select({ id: messages.id }).from(messages).where(where).orderBy(messages.id).all()
  const outcomes: DeliveryOutcome[] = []
  for (const { id } of failed) outcomes.push(await deliverOutboxMessage(db, id, { force: true, send }))
  return outcomes
}

export interface OutboxListFilter {
  status?: Message['status']
  kind?: string
  limit: number
  beforeId?: number
}

/** The outbox, newest first, without the bodies; with counts per status. */
export function listOutboxMessages(db: AppDatabase, filter: OutboxListFilter) {
  const conditions: SQL[] = []
  if (filter.status) conditions.push(eq(messages.status, filter.status))
  if (filter.kind) conditions.push(eq(messages.kind, filter.kind))
  if (filter.beforeId) conditions.push(sql`${messages.id} < ${filter.beforeId}`)
  const rows = db.select({
    id: messages.id, kind: messages.kind, personId: messages.personId, personName: people.name, toEmail: messages.toEmail,
    subject: messages.subject, status: messages.status, attempts: messages.attempts, lastError: messages.lastError,
    nextAttemptAt: messages.nextAttemptAt, sentAt: messages.sentAt, createdAt: messages.createdAt
  }).from(messages).leftJoin(people, eq(people.id, messages.personId))
    .where(conditions.length ? and(...conditions) : undefined).orderBy(desc(messages.id)).limit(filter.limit).all()
  const counts = { queued: 0, sent: 0, failed: 0 }
  for (const c of db.select({ status: messages.status, n: sql<number>`count(*)` }).from(messages).groupBy(messages.status).all()) counts[c.status] = c.n
  return { messages: rows.map(toOutboxSummary), counts }
}

function toOutboxSummary<T extends { nextAttemptAt: Date | null, sentAt: Date | null, createdAt: Date }>(row: T) {
  return {
    ...row,
    nextAttemptAt: row.nextAttemptAt?.toISOString() ?? null,
    sentAt: row.sentAt?.toISOString() ?? null,
    createdAt: row.createdAt.toISOString()
  }
}

/** One message with its HTML, text and meta, or undefined. */
export function findOutboxMessage(db: AppDatabase, id: number) {
  const row = db.select().from(messages).where(eq(messages.id, id)).get()
  if (!row) return undefined
  const person = row.personId ? db.select({ name: people.name }).from(people).where(eq(people.id, row.personId)).get() : undefined
  const { sealedLink: _sealed, ...meta } = row.meta ?? {}
  return { ...toOutboxSummary(row), meta: row.meta ? meta : null, personName: person?.name ?? null }
}
