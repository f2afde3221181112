// `npm run bench:load`: the built server as `npm start` runs it (scripts/cluster.mjs, one worker per
// core) on localhost, under autocannon, each figure printed beside its target:
//  - the calendar week of 592 shifts at 50 clients, without and with compression (br, gzip): target
//    p99 < 100 ms and no error; a month of /api/light at 50 clients likewise;
//  - the uncached week (the shift list computed from the database, in process) on a young database of
//    2,000 shifts and on one of 100,000 (the same week in year five): target median within 1.5×;
//  - 20 writers moving five shifts: no accepted change lost, every refusal a 409;
//  - a 10,000-row shift import over HTTP;
//  - the server's peak resident memory (VmHWM of the primary and each worker) through all of it:
//    target < 600 MB.
// Traffic stays on 127.0.0.1. LOAD_SECONDS (default 20) sets each run's length.
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import autocannon from 'autocannon'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { applyMigrations, openDatabase } from '../server/utils/db'
import { findShiftsInRange } from '../server/services/shifts'
import { seedLoadScenario, WEEK_SHIFTS } from './load-scenario'
import { ApiClient, OUTPUT_DIR, startAppServer } from '../tests/support/app-server'

const SECONDS = Number(process.env.LOAD_SECONDS || 20)
const PASSWORD = 'load-test-password-2026'
const MIGRATIONS = resolve(import.meta.dirname, '../drizzle')
const P99_TARGET_MS = 100
const GROWTH_TARGET = 1.5
const MEMORY_TARGET_MB = 600

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

function report(title: string, r: autocannon.Result) {
  const errors = r.errors + r.timeouts + (r.non2xx ?? 0)
  const met = r.latency.p99 < P99_TARGET_MS && errors === 0
  console.log(`${title.padEnd(58)} ${r.requests.average.toFixed(0).padStart(6)} req/s  p50 ${String(r.latency.p50).padStart(4)} ms  p99 ${String(r.latency.p99).padStart(4)} ms  errors ${errors}`
    + `   target p99 < ${P99_TARGET_MS} ms, no error: ${met ? 'met' : 'NOT met'}`)
  return met
}

async function runReads(url: string, cookie: string, path: string, title: string, encoding: string | null) {
  const headers: Record<string, string> = { cookie, accept: 'application/json' }
  if (encoding) headers['accept-encoding'] = encoding
  // node:http, not fetch: fetch asks for compression itself and hides the size on the wire
  const { request } = await import('node:http')
  const size = await new Promise<number>((res, rej) => {
    request(`${url}${path}`, { headers }, (reply) => {
      let bytes = 0
      reply.on('data', (c: Buffer) => { bytes += c.length })
      reply.on('end', () => res(bytes))
    }).on('error', rej).end()
  })
  const result = await autocannon({ url: `${url}${path}`, connections: 50, duration: SECONDS, headers })
  return report(`${title}, ${encoding ?? 'uncompressed'} (${(size / 1024).toFixed(0)} KiB)`, result)
}

async function runWriters(client: ApiClient, shiftIds: number[]) {
  const accepted = new Map<number, { version: number, start: string }[]>()
  let refused = 0
  let other = 0
  const otherStatuses = new Set<string>()
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
      else {
        other++
        otherStatuses.add(`${reply.status} ${JSON.stringify(reply.body).slice(0, 120)}`)
      }
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
  const met = lost === 0 && other === 0
  for (const status of otherStatuses) console.log(`  other reply: ${status}`)
  console.log(`20 writers for ${SECONDS} s: ${total} changes accepted, ${refused} refused with 409, ${other} other replies, ${lost} shifts with a lost update   target none lost, no other reply: ${met ? 'met' : 'NOT met'}`)
  return met
}

async function seedDatabase(dir: string, name: string, totalShifts: number, passwordHash: string, now: number) {
  const path = join(dir, `${name}.sqlite`)
  const db = openDatabase(path)
  applyMigrations(db, MIGRATIONS)
  const started = performance.now()
  const scenario = seedLoadScenario(db, passwordHash, now, { totalShifts })
  console.log(`seeded ${name}: ${scenario.shifts} shifts (${WEEK_SHIFTS} in the week), ${scenario.people} people, ${scenario.sites} sites in ${((performance.now() - started) / 1000).toFixed(1)} s`)
  return { path, db, scenario }
}

// The uncached week: the reply computed from the database, as a cache miss does, in this process.
function timeUncachedWeek(db: ReturnType<typeof openDatabase>, from: string, to: string) {
  for (let i = 0; i < 3; i++) findShiftsInRange(db, { from, to })
  const times: number[] = []
  let count = 0
  for (let i = 0; i < 15; i++) {
    const t0 = performance.now()
    count = findShiftsInRange(db, { from, to }).length
    times.push(performance.now() - t0)
  }
  return { median: median(times), count }
}

function processTree(rootPid: number): number[] {
  const pids = [rootPid]
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8')
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1])
      if (ppid === rootPid) pids.push(Number(entry))
    } catch { /* gone */ }
  }
  return pids
}

// Peak resident set (VmHWM) of each process of the server, in MB.
function readPeakMemory(rootPid: number) {
  return processTree(rootPid).map((pid) => {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8')
    return { pid, mb: Number(/VmHWM:\s+(\d+) kB/.exec(status)?.[1] ?? 0) / 1024 }
  })
}

function buildImportCsv(rows: number, siteNames: string[], emails: string[], firstDay: string) {
  const lines = ['site,title,start,end,light,assignees,notes']
  const base = Date.parse(`${firstDay}T00:00:00Z`)
  for (let i = 0; i < rows; i++) {
    const day = new Date(base + Math.floor(i / 12) * 86_400_000).toISOString().slice(0, 10)
    const hour = String(6 + (i % 12)).padStart(2, '0')
    const endHour = String(8 + (i % 12)).padStart(2, '0')
    const people = `${emails[4 + (i % 12) * 2]};${emails[5 + (i % 12) * 2]}`
    lines.push(`${siteNames[i % siteNames.length]},Imported task ${i + 1},${day} ${hour}:00,${day} ${endHour}:00,${['daylight', 'civil', 'any'][i % 3]},${people},load import`)
  }
  return lines.join('\n')
}

export async function runLoadBench() {
  const dir = mkdtempSync(join(tmpdir(), 'gloamline-load-'))
  const now = Date.parse('2027-01-11T08:00:00Z')
  const passwordHash = await new Hash(new Scrypt({})).make(PASSWORD)
  const young = await seedDatabase(dir, 'young', 2_000, passwordHash, now)
  const old = await seedDatabase(dir, 'year-five', 100_000, passwordHash, now)
  const { weekFrom, weekTo } = young.scenario
  const small = timeUncachedWeek(young.db, weekFrom, weekTo)
  const large = timeUncachedWeek(old.db, weekFrom, weekTo)
  const ratio = large.median / small.median
  console.log(`uncached week (${small.count} shifts), in process: 2,000-shift database median ${small.median.toFixed(1)} ms, 100,000-shift database median ${large.median.toFixed(1)} ms`
    + ` = ${ratio.toFixed(2)}×   target ≤ ${GROWTH_TARGET}×: ${ratio <= GROWTH_TARGET && small.count === large.count ? 'met' : 'NOT met'}`)
  young.db.$client.close()
  old.db.$client.close()

  const server = await startAppServer({
    seed: false,
    databasePath: young.path,
    clockStart: new Date(now).toISOString(),
    script: resolve(import.meta.dirname, '../scripts/cluster.mjs'),
    env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off', GLOAMLINE_OUTPUT_DIR: OUTPUT_DIR }
  })
  const results: boolean[] = []
  try {
    await server.waitForOutput(/workers? serving/)
    await server.waitForOutput(/Listening on[\s\S]*Listening on/)
    const client = new ApiClient(server.url)
    await client.signIn(young.scenario.coordinatorEmail, PASSWORD)
    const workers = processTree(server.process.pid!).length - 1
    console.log(`server: scripts/cluster.mjs with ${workers} workers; ${SECONDS} s per run, 50 clients`)
    const week = `/api/shifts?from=${weekFrom}&to=${weekTo}`
    for (const encoding of [null, 'br', 'gzip']) results.push(await runReads(server.url, client.cookie, week, `GET /api/shifts (week of ${WEEK_SHIFTS})`, encoding))
    const light = `/api/light?lat=78.22&lon=15.63&tz=Arctic/Longyearbyen&from=${young.scenario.monthFrom}&to=${young.scenario.monthTo}`
    for (const encoding of [null, 'br']) results.push(await runReads(server.url, client.cookie, light, 'GET /api/light (a month at 78°N)', encoding))
    results.push(await runWriters(client, young.scenario.contestedShiftIds))
    const csv = buildImportCsv(10_000, young.scenario.siteNames, young.scenario.emails, '2028-01-01')
    const t0 = performance.now()
    const imported = await client.post('/api/import/shifts', { csv })
    const importMs = performance.now() - t0
    console.log(`import of 10,000 shift rows (${(csv.length / 1024).toFixed(0)} KiB of CSV): ${imported.status} in ${(importMs / 1000).toFixed(1)} s`)
    results.push(imported.status === 201)
    const peaks = readPeakMemory(server.process.pid!)
    const total = peaks.reduce((sum, p) => sum + p.mb, 0)
    const largest = Math.max(...peaks.map(p => p.mb))
    console.log(`peak resident memory through the load and the import: ${peaks.map(p => `${p.mb.toFixed(0)}`).join(' + ')} MB (primary + workers) = ${total.toFixed(0)} MB, largest process ${largest.toFixed(0)} MB`
      + `   target < ${MEMORY_TARGET_MB} MB: ${total < MEMORY_TARGET_MB ? 'met' : 'NOT met'}`)
    results.push(total < MEMORY_TARGET_MB)
    console.log(results.every(Boolean) ? 'all load targets met' : 'SOME LOAD TARGETS MISSED (see the lines above)')
  } finally {
    await server.stop()
    rmSync(dir, { recursive: true, force: true })
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await runLoadBench()
