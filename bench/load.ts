// `npm run bench:load`: the built server on localhost with 2,000 shifts and 50 people, under
// autocannon: 50 clients for 20 s on the calendar week and on a month of /api/light, then 20
// writers moving shifts for 20 s, checking that no accepted change is lost and every refusal is a 409.
// Targets (this 2-core machine): p99 under 100 ms and zero errors. Traffic stays on 127.0.0.1.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import autocannon from 'autocannon'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { applyMigrations, openDatabase } from '../server/utils/db'
import { seedLoadScenario } from './load-scenario'
import { ApiClient, startAppServer } from '../tests/support/app-server'

const SECONDS = Number(process.env.LOAD_SECONDS || 20)
const PASSWORD = 'load-test-password-2026'

function report(title: string, r: autocannon.Result) {
  const errors = r.errors + r.timeouts + (r.non2xx ?? 0)
  console.log(`${title}: ${r.requests.average.toFixed(0)} req/s, p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, errors ${errors} (non-2xx ${r.non2xx}, timeouts ${r.timeouts})`)
  return { p99: r.latency.p99, errors }
}

async function runReads(url: string, cookie: string, path: string, title: string) {
  const probe = await fetch(`${url}${path}`, { headers: { cookie } })
  console.log(`${path.split('?')[0]}: reply of ${((await probe.arrayBuffer()).byteLength / 1024).toFixed(0)} KiB`)
  const result = await autocannon({ url: `${url}${path}`, connections: 50, duration: SECONDS, headers: { cookie, accept: 'application/json' } })
  return report(title, result)
}

async function runWriters(url: string, client: ApiClient, shiftIds: number[]) {
  const accepted = new Map<number, { version: number, start: string }[]>()
  let refused = 0
  let other = 0
  const deadline = Date.now() + SECONDS * 1000
  async function writer(seed: number) {
    let i = seed
    while (Date.now() < deadline) {
      const id = shiftIds[(i++ * 7919) % shiftIds.length]!
      const current = await client.get(`/api/shifts/${id}`)
      const minutes = 15 * ((i % 8) - 4 || 1)
      const start = new Date(Date.parse(current.body.start) + minutes * 60_000).toISOString()
      const end = new Date(Date.parse(current.body.end) + minutes * 60_000).toISOString()
      const reply = await client.patch(`/api/shifts/${id}`, { start, end, version: current.body.version })
      if (reply.status === 200) {
        const list = accepted.get(id) ?? []
        list.push({ version: reply.body.version, start: reply.body.start })
        accepted.set(id, list)
      } else if (reply.status === 409) refused++
      else other++
    }
  }
  // five shifts for twenty writers: they collide often, which is the point
  await Promise.all(Array.from({ length: 20 }, (_, k) => writer(k)))
  let lost = 0
  for (const [id, changes] of accepted) {
    const final = (await client.get(`/api/shifts/${id}`)).body
    const last = changes.sort((a, b) => a.version - b.version).at(-1)!
    if (final.version !== changes.length + 1 || Date.parse(final.start) !== Date.parse(last.start)) lost++
  }
  const total = [...accepted.values()].reduce((n, c) => n + c.length, 0)
  console.log(`20 writers for ${SECONDS} s: ${total} changes accepted, ${refused} refused with 409, ${other} other replies, ${lost} shifts with a lost update`)
  return { lost, other }
}

export async function runLoadBench() {
  const dir = mkdtempSync(join(tmpdir(), 'gloamline-load-'))
  const databasePath = join(dir, 'load.sqlite')
  const db = openDatabase(databasePath)
  applyMigrations(db, resolve(import.meta.dirname, '../drizzle'))
  const passwordHash = await new Hash(new Scrypt({})).make(PASSWORD)
  const scenario = seedLoadScenario(db, passwordHash, Date.now())
  db.$client.close()
  console.log(`seeded ${scenario.shifts} shifts, ${scenario.people} people, ${scenario.sites} sites`)
  const server = await startAppServer({ seed: false, databasePath, env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off' } })
  try {
    const client = new ApiClient(server.url)
    await client.signIn(scenario.coordinatorEmail, PASSWORD)
    const week = await runReads(server.url, client.cookie, `/api/shifts?from=${scenario.weekFrom}&to=${scenario.weekTo}`, `GET /api/shifts (one week, all sites), 50 clients, ${SECONDS} s`)
    const light = await runReads(server.url, client.cookie, `/api/light?lat=78.22&lon=15.63&tz=Arctic/Longyearbyen&from=${scenario.monthFrom}&to=${scenario.monthTo}`, `GET /api/light (one month at 78°N), 50 clients, ${SECONDS} s`)
    const writes = await runWriters(server.url, client, scenario.contestedShiftIds)
    const ok = week.p99 < 100 && light.p99 < 100 && week.errors === 0 && light.errors === 0 && writes.lost === 0 && writes.other === 0
    console.log(ok ? 'targets met: p99 < 100 ms, no errors, no lost update' : 'TARGETS MISSED (see figures above)')
  } finally {
    await server.stop()
    rmSync(dir, { recursive: true, force: true })
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await runLoadBench()
