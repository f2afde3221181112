// Reminders across a crash and across two processes on one database. The local SMTP sink holds each
// message, the connection open, before answering "accepted" (scripts/mail-sink.mjs, delayMs): a
// server killed meanwhile never hears the acceptance, and the sink records that message as
// abandoned. So "the kill landed inside a send" is observed, not assumed.
import Database from 'better-sqlite3'
import { afterEach, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { OUTBOX_LEASE_MS } from '../../server/services/outbox'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK, utcDateOf } from '../support/clock'
import { countPerRecipient, expectedReminderRecipients } from '../support/reminders'

type Sink = Awaited<ReturnType<typeof startMailSink>>
const running: AppServer[] = []
let sink: Sink | undefined
afterEach(async () => {
  for (const s of running.splice(0).reverse()) await s.stop()
  await sink?.close()
  sink = undefined
})

// no background sender (the reminder and field alert timers) beside the runs under test
const ENV = { REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off', REQUEST_LOG: 'off' }

function leasedUnsent(databasePath: string) {
  const db = new Database(databasePath, { readonly: true })
  try {
    return db.prepare('select id, to_email as email, lease_until as leaseUntil from messages where status != \'sent\' and lease_until is not null').all() as { id: number, email: string, leaseUntil: number }[]
  } finally {
    db.close()
  }
}

describe('a server killed while sending reminders', () => {
  it('SIGKILL inside a send, restart on the same database: the held message waits for its lease, then every reminder has arrived exactly once', async () => {
    sink = await startMailSink({ delayMs: 400 })
    const env = { ...ENV, SMTP_URL: sink.url }
    // Saturday evening: the reminders are for a Sunday
    const first = await startAppServer({ env, clockStart: TEST_CLOCK.saturdayEveningBeforeChange })
    running.push(first)
    const date = utcDateOf(first.clock.startMs, 1)
    const expected = expectedReminderRecipients(first.databasePath, date)
    expect(expected.size).toBeGreaterThan(3)
    const coordinator = await signedInClient(first, 'coordinator@gloamline.test')
    const run = coordinator.post(`/api/reminders/run?date=${date}`).catch(() => null)
    // the second message is being held by the mail server (the first was accepted): kill now
    await sink.waitFor('holding', 2)
    await first.kill()
    await run
    // the proof that the kill was inside the sending: the sink saw the sender go mid-message
    await sink.waitFor('abandoned', 1)
    expect(sink.messages).toHaveLength(1)
    expect(sink.abandoned).toHaveLength(1)
    // and the database holds that message as claimed (leased) but not sent
    const held = leasedUnsent(first.databasePath)
    expect(held.map(h => h.email)).toEqual(sink.abandoned[0]!.to)

    // restarted a minute later: the lease still holds, so the in-flight message is not sent yet
    const soon = await startAppServer({ env, databasePath: first.databasePath, clockStart: new Date(first.clock.now() + 60_000).toISOString() })
    running.push(soon)
    const afterCrash = await (await signedInClient(soon, 'coordinator@gloamline.test')).post(`/api/reminders/run?date=${date}`)
    expect(afterCrash.status).toBe(200)
    expect(afterCrash.body).toEqual({ sent: expected.size - 2, pending: 1 })
    await soon.stop()

    // restarted after the lease has run out: the held message goes out, once
    const later = await startAppServer({ env, databasePath: first.databasePath, clockStart: new Date(first.clock.now() + OUTBOX_LEASE_MS + 60_000).toISOString() })
    running.push(later)
    const again = await signedInClient(later, 'coordinator@gloamline.test')
    expect((await again.post(`/api/reminders/run?date=${date}`)).body).toEqual({ sent: 1, pending: 0 })
    // the run answers after its sends have been accepted: what the sink holds now is final
    expect((await again.post(`/api/reminders/run?date=${date}`)).body).toEqual({ sent: 0, pending: 0 })
    const perPerson = countPerRecipient(sink.messages)
    expect([...perPerson.keys()].sort()).toEqual([...expected.keys()].sort())
    expect([...perPerson.entries()].filter(([, n]) => n !== 1)).toEqual([])
  }, 120_000)
})

describe('two server processes on one database', () => {
  it('forced sends in both at once (a reminder run in each) respect each other\'s leases: every reminder arrives exactly once', async () => {
    sink = await startMailSink({ delayMs: 300 })
    const env = { ...ENV, SMTP_URL: sink.url }
    const a = await startAppServer({ env, clockStart: TEST_CLOCK.southernSummerSunday })
    running.push(a)
    const b = await startAppServer({ env, databasePath: a.databasePath, clockStart: TEST_CLOCK.southernSummerSunday })
    running.push(b)
    const date = utcDateOf(a.clock.startMs, 1)
    const expected = expectedReminderRecipients(a.databasePath, date)
    expect(expected.size).toBeGreaterThan(3)
    const [inA, inB] = await Promise.all([signedInClient(a, 'coordinator@gloamline.test'), signedInClient(b, 'coordinator@gloamline.test')])
    // B starts while A is inside its first send (the sink is holding it)
    const runA = inA.post(`/api/reminders/run?date=${date}`)
    await sink.waitFor('holding', 1)
    const runB = inB.post(`/api/reminders/run?date=${date}`)
    const [ra, rb] = await Promise.all([runA, runB])
    expect([ra.status, rb.status]).toEqual([200, 200])
    // each message was sent by one of them: together exactly the expected number
    expect(ra.body.sent + rb.body.sent).toBe(expected.size)
    expect(rb.body.sent).toBeGreaterThan(0)
    expect((await inA.post(`/api/reminders/run?date=${date}`)).body).toEqual({ sent: 0, pending: 0 })
    const perPerson = countPerRecipient(sink.messages)
    expect([...perPerson.keys()].sort()).toEqual([...expected.keys()].sort())
    expect([...perPerson.entries()].filter(([, n]) => n !== 1)).toEqual([])
    expect(sink.abandoned).toEqual([])
  }, 120_000)
})
