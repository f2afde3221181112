// The outbox on a fresh SQLite database with the migrations applied: dedupe, delivery, failure with
// exponential back-off, recovery delivering exactly once, and two senders racing for one message.
// The senders here are stand-ins that record calls; the real SMTP path is in mail-transport.test.ts.
import { eq } from 'drizzle-orm'
import { afterEach, describe, expect, it } from 'vitest'
import { messages } from '../../server/db/schema'
import {
  OUTBOX_MAX_ATTEMPTS, computeRetryDelayMs, deliverDueOutboxMessages, deliverOutboxMessage,
  enqueueOutboxMessage, findDueOutboxIds, listOutboxMessages, retryFailedOutboxMessages
} from '../../server/services/outbox'
import type { OutgoingMail } from '../../server/adapters/mail'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const BASE = 60_000

function freshDatabase() {
  return createTestDatabase('gloamline-outbox-')
}

afterEach(removeTestDatabases)

function sample(key = 'reminder:1:2027-01-14:5,7') {
  return { dedupeKey: key, kind: 'reminder', personId: null, toEmail: 'liv.aasen@northwake.test', subject: 'Thu 14 Jan: 2 shifts', html: '<p>hi</p>', text: 'hi' }
}

function recordingSender(fail = false) {
  const sent: OutgoingMail[] = []
  const send = async (mail: OutgoingMail) => {
    if (fail) throw Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:9'), { code: 'ECONNREFUSED' })
    sent.push(mail)
    return { messageId: `<${sent.length}@test>` }
  }
  return { sent, send }
}

describe('outbox', () => {
  it('keeps one message per dedupe key, however often it is queued', () => {
    const db = freshDatabase()
    const first = enqueueOutboxMessage(db, sample())
    const second = enqueueOutboxMessage(db, { ...sample(), subject: 'another rendering' })
    expect(first.created).toBe(true)
    expect(second).toEqual({ id: first.id, created: false })
    expect(db.select().from(messages).all()).toHaveLength(1)
  })

  it('sends a queued message once and records it as sent', async () => {
    const db = freshDatabase()
    const { id } = enqueueOutboxMessage(db, sample())
    const sender = recordingSender()
    expect(await deliverOutboxMessage(db, id, { send: sender.send })).toEqual({ id, status: 'sent' })
    expect(await deliverOutboxMessage(db, id, { send: sender.send })).toEqual({ id, status: 'skipped' })
    expect(sender.sent).toHaveLength(1)
    const row = db.select().from(messages).where(eq(messages.id, id)).get()!
    expect(row).toMatchObject({ status: 'sent', attempts: 1, lastError: null, nextAttemptAt: null })
    expect(row.sentAt).toBeInstanceOf(Date)
  })

  it('marks a failed send with the error and retries after an exponential back-off, then delivers exactly once', async () => {
    const db = freshDatabase()
    const { id } = enqueueOutboxMessage(db, sample())
    const t0 = Date.parse('2027-01-13T17:00:00Z')
    const down = recordingSender(true)
    expect((await deliverOutboxMessage(db, id, { nowMs: t0, send: down.send })).status).toBe('failed')
    let row = db.select().from(messages).where(eq(messages.id, id)).get()!
    expect(row.status).toBe('failed')
    expect(row.attempts).toBe(1)
    expect(row.lastError).toContain('ECONNREFUSED')
    expect(row.nextAttemptAt!.getTime()).toBe(t0 + BASE)
    // not due before the back-off has passed
    expect(findDueOutboxIds(db, t0 + BASE - 1)).toEqual([])
    await deliverDueOutboxMessages(db, t0 + BASE, down.send)
    row = db.select().from(messages).where(eq(messages.id, id)).get()!
    expect(row.attempts).toBe(2)
    expect(row.nextAttemptAt!.getTime()).toBe(t0 + BASE + 2 * BASE)
    // the server is back: the next due run delivers it, and later runs send nothing more
    const up = recordingSender()
    await deliverDueOutboxMessages(db, t0 + 3 * BASE, up.send)
    await deliverDueOutboxMessages(db, t0 + 100 * BASE, up.send)
    expect(up.sent).toHaveLength(1)
    expect(db.select().from(messages).where(eq(messages.id, id)).get()).toMatchObject({ status: 'sent', attempts: 3, lastError: null })
  })

  it('doubles the delay after each failure and caps it at one hour', () => {
    expect([1, 2, 3, 4, 5, 6, 7, 8].map(n => computeRetryDelayMs(n, BASE) / BASE)).toEqual([1, 2, 4, 8, 16, 32, 60, 60])
  })

  it('stops retrying by itself after the attempt limit, and a coordinator retry still sends it', async () => {
    const db = freshDatabase()
    const { id } = enqueueOutboxMessage(db, sample())
    const down = recordingSender(true)
    let now = Date.parse('2027-01-13T17:00:00Z')
    for (let i = 0; i < OUTBOX_MAX_ATTEMPTS; i++) {
      await deliverOutboxMessage(db, id, { nowMs: now, force: true, send: down.send })
      now += 2 * 3_600_000
    }
    const row = db.select().from(messages).where(eq(messages.id, id)).get()!
    expect(row).toMatchObject({ status: 'failed', attempts: OUTBOX_MAX_ATTEMPTS, nextAttemptAt: null })
    expect(findDueOutboxIds(db, now + 365 * 86_400_000)).toEqual([])
    const up = recordingSender()
    const outcomes = await retryFailedOutboxMessages(db, undefined, up.send)
    expect(outcomes).toEqual([{ id, status: 'sent' }])
    expect(up.sent).toHaveLength(1)
  })

  it('lets only one of two simultaneous senders send a message', async () => {
    const db = freshDatabase()
    const { id } = enqueueOutboxMessage(db, sample())
    let calls = 0
    const slow = async () => {
      calls++
      await new Promise(r => setTimeout(r, 50))
      return { messageId: 'x' }
    }
    const results = await Promise.all([
      deliverOutboxMessage(db, id, { send: slow }),
      deliverOutboxMessage(db, id, { send: slow, force: true }),
      deliverDueOutboxMessages(db, Date.now(), slow)
    ])
    expect(calls).toBe(1)
    expect(results[0]).toEqual({ id, status: 'sent' })
    expect(results[1]).toEqual({ id, status: 'skipped' })
  })

  it('lists messages newest first with counts per status, without their bodies', async () => {
    const db = freshDatabase()
    const a = enqueueOutboxMessage(db, sample('reminder:1:2027-01-14:5'))
    const b = enqueueOutboxMessage(db, sample('reminder:2:2027-01-14:5'))
    await deliverOutboxMessage(db, a.id, { send: recordingSender().send })
    const list = listOutboxMessages(db, { limit: 10 })
    expect(list.messages.map(m => m.id)).toEqual([b.id, a.id])
    expect(list.counts).toEqual({ queued: 1, sent: 1, failed: 0 })
    expect(list.messages[0]).not.toHaveProperty('html')
    expect(listOutboxMessages(db, { limit: 10, status: 'sent' }).messages.map(m => m.id)).toEqual([a.id])
  })
})
