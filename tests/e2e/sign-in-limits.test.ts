// The sign-in limiter under attack, against the built server. Each case starts its own server, since
// every request here comes from one client address and that address's count is part of what is tested.
// Rules checked (server/services/sign-in-limits.ts): five free failures per account, then a delay
// that doubles per failure; at most 30 failures per client address in 15 minutes; the count is
// charged before the password hash, so parallel guesses cannot slip past it; fails closed when it
// cannot write.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, describe, expect, it } from 'vitest'
import { ApiClient, DEMO_PASSWORD, startAppServer, type AppServer } from '../support/app-server'

const running: AppServer[] = []
const folders: string[] = []
afterEach(async () => {
  await Promise.all(running.splice(0).map(s => s.stop()))
  for (const f of folders.splice(0)) rmSync(f, { recursive: true, force: true })
})

async function start(env: Record<string, string> = {}, databasePath?: string) {
  const server = await startAppServer({ env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off', ...env }, databasePath })
  running.push(server)
  return server
}

function guess(server: AppServer, email: string, password: string) {
  return new ApiClient(server.url).post('/api/auth/login', { email, password })
}

function tally(statuses: number[]) {
  return statuses.reduce<Record<number, number>>((acc, s) => ({ ...acc, [s]: (acc[s] ?? 0) + 1 }), {})
}

describe('the sign-in limiter', () => {
  it('checks only five of 40 parallel wrong guesses for one account; the rest wait (429)', async () => {
    const server = await start()
    const replies = await Promise.all(Array.from({ length: 40 }, (_, i) => guess(server, 'crew@gloamline.test', `wrong-guess-${i}`)))
    const counts = tally(replies.map(r => r.status))
    expect(counts).toEqual({ 401: 5, 429: 35 })
    const waiting = replies.find(r => r.status === 429)!
    expect(Number(waiting.headers.get('retry-after'))).toBeGreaterThanOrEqual(1)
  })

  it('measures 100 parallel wrong guesses for one account', async () => {
    const server = await start()
    const started = performance.now()
    const replies = await Promise.all(Array.from({ length: 100 }, (_, i) => guess(server, 'safety@gloamline.test', `wrong-guess-${i}`)))
    const ms = Math.round(performance.now() - started)
    const counts = tally(replies.map(r => r.status))
    console.info(`[sign-in limiter] 100 parallel wrong guesses for one account: ${JSON.stringify(counts)} in ${ms} ms`)
    // five free failures, then one more each time a doubling delay (1 s, 2 s, 4 s…) has run out while
    // the burst was still arriving: k extra checks need 2^k − 1 seconds
    const extra = Math.floor(Math.log2(ms / 1000 + 1))
    expect(counts[401]).toBeGreaterThanOrEqual(5)
    expect(counts[401]).toBeLessThanOrEqual(5 + extra)
    expect(counts[401]! + counts[429]!).toBe(100)
  })

  it('limits guesses spread over 12 accounts from one client address (108 guesses)', async () => {
    const server = await start()
    const accounts = ['crew', 'safety', 'coordinator', 'liv.aasen', 'kalle.niemi', 'sofia.marchetti', 'jonas.eide', 'nora.tuktu', 'owen.mcbride', 'hanna.lindqvist', 'pita.rangi', 'elias.brandt']
    const statuses: number[] = []
    for (let round = 0; round < 9; round++) {
      for (const name of accounts) statuses.push((await guess(server, `${name}@gloamline.test`, `wrong-${round}`)).status)
    }
    const counts = tally(statuses)
    // 5 free failures per account would let 60 through; the address stops them at 30
    expect(counts[401]).toBe(30)
    expect(counts[429]).toBe(78)
    const last = await guess(server, 'greta.holm@gloamline.test', 'wrong-again')
    expect(last.status).toBe(429)
    expect(last.body.message).toMatch(/this network/)
  })

  it('slows a stranger down without locking the owner out: after the delay the right password works', async () => {
    const server = await start()
    const email = 'liv.aasen@gloamline.test'
    for (let i = 0; i < 5; i++) expect((await guess(server, email, `wrong-${i}`)).status).toBe(401)
    const held = await guess(server, email, DEMO_PASSWORD)
    expect(held.status).toBe(429)
    const wait = Number(held.headers.get('retry-after'))
    expect(wait).toBeGreaterThanOrEqual(1)
    expect(wait).toBeLessThanOrEqual(2)
    await new Promise(r => setTimeout(r, wait * 1000 + 100))
    expect((await guess(server, email, DEMO_PASSWORD)).status).toBe(200)
    // a success starts the account afresh: five more wrong guesses are checked again
    for (let i = 0; i < 5; i++) expect((await guess(server, email, `again-${i}`)).status).toBe(401)
  })

  it('fails closed when failures cannot be recorded (read-only database): no guess is checked, not even a right one after 20 wrong', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'gloamline-limits-'))
    folders.push(folder)
    const databasePath = join(folder, 'limits.sqlite')
    const first = await start({}, databasePath)
    first.process.kill('SIGTERM')
    await new Promise(r => first.process.once('exit', r))
    const readOnly = await start({ DATABASE_READ_ONLY: '1' }, databasePath)
    const replies = await Promise.all(Array.from({ length: 20 }, (_, i) => guess(readOnly, 'crew@gloamline.test', `wrong-${i}`)))
    expect(tally(replies.map(r => r.status))).toEqual({ 503: 20 })
    // uncounted guesses would make the right password stand out from the wrong ones: it must not
    const right = await guess(readOnly, 'crew@gloamline.test', DEMO_PASSWORD)
    expect(right.status).toBe(503)
    expect(right.body.message).toBeTruthy()
  })
})
