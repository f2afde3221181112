// A server restarted while it is sending reminders: the restarted one finishes the job, and each
// person still gets exactly one reminder. The mail server is the local sink, slowed down so that
// the restart lands in the middle of the sending.
import { afterAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'

const running: AppServer[] = []
let sink: Awaited<ReturnType<typeof startMailSink>> | undefined
afterAll(async () => {
  for (const s of running) await s.stop()
  await sink?.close()
})

function tomorrow() {
  return new Date(Date.now() + 86_400_000).toISOString().slice(0, 10)
}

describe('restart during reminder sending', () => {
  it('sends each reminder once across a restart', async () => {
    sink = await startMailSink({ delayMs: 250 })
    const env = { SMTP_URL: sink.url, REMINDER_TIMER: 'off', REQUEST_LOG: 'off' }
    const first = await startAppServer({ env })
    running.push(first)
    const coordinator = await signedInClient(first, 'coordinator@gloamline.test')
    const date = tomorrow()
    const run = coordinator.post(`/api/reminders/run?date=${date}`).catch(() => null)
    // restart (SIGTERM, as a service manager does) once sending has begun
    while (sink.messages.length === 0) await new Promise(r => setTimeout(r, 50))
    first.process.kill('SIGTERM')
    await run
    if (first.process.exitCode === null && first.process.signalCode === null) await new Promise(r => first.process.once('exit', r))
    const sentBeforeRestart = sink.messages.length

    const second = await startAppServer({ env, databasePath: first.databasePath })
    running.push(second)
    const again = await signedInClient(second, 'coordinator@gloamline.test')
    const reply = await again.post(`/api/reminders/run?date=${date}`)
    expect(reply.status).toBe(200)
    const third = await again.post(`/api/reminders/run?date=${date}`)
    expect(third.body.sent).toBe(0)

    const reminders = sink.messages
    const perPerson = new Map<string, number>()
    for (const m of reminders) for (const to of m.to) perPerson.set(to, (perPerson.get(to) ?? 0) + 1)
    expect(perPerson.size).toBeGreaterThan(1)
    expect(sentBeforeRestart).toBeGreaterThan(0)
    expect([...perPerson.entries()].filter(([, n]) => n !== 1)).toEqual([])
  }, 90_000)
})
