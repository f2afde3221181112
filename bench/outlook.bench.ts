// Light outlook benchmarks: the year chart's data for one site (target < 150 ms) and a slot search
// over 30 days for a crew of 6 (target < 200 ms), each as the route computes it (the slot search on a
// fresh SQLite database with the demo scenario and a busy extra roster). Prints figures; asserts nothing.
import { existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { applyMigrations, openDatabase, type AppDatabase } from '../server/utils/db'
import { seedDemoScenario } from '../server/db/seed'
import { people, shiftAssignees, shifts, sites } from '../server/db/schema'
import { clearTimeZoneCache } from '../server/core/time/zone-table'
import { computeYearChart } from '../server/core/light/year-chart'
import { computeRunup } from '../server/core/light/runup'
import { loadLightBoard } from '../server/services/light-board'
import { searchSlots } from '../server/services/slot-search'
import { localDateOf, localMidnightMs } from '../server/core/time/zoned'
import { addDays } from '../shared/format'
import { OUTPUT_DIR, signedInClient, startAppServer } from '../tests/support/app-server'

const KVITFJELL = { siteId: 1, latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen', year: 2027 }

function measure(label: string, runs: number, target: number | null, fn: () => unknown) {
  for (let i = 0; i < 3; i++) fn()
  const times: number[] = []
  for (let i = 0; i < runs; i++) {
    const t = performance.now()
    fn()
    times.push(performance.now() - t)
  }
  times.sort((a, b) => a - b)
  const pick = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))]!
  const verdict = target === null ? '' : `  target < ${target} ms: ${pick(0.95) < target ? 'met' : 'NOT met'} (p95)`
  console.log(`${label.padEnd(58)} median ${pick(0.5).toFixed(1).padStart(6)} ms  p95 ${pick(0.95).toFixed(1).padStart(6)} ms  max ${times[times.length - 1]!.toFixed(1).padStart(6)} ms  (${runs} runs)${verdict}`)
}

function benchYearChart() {
  clearTimeZoneCache()
  const t = performance.now()
  const first = JSON.stringify(computeYearChart(KVITFJELL))
  console.log(`year chart, 78° N, first call in a fresh process (zone tables cold): ${(performance.now() - t).toFixed(1)} ms, ${(first.length / 1024).toFixed(0)} KiB of JSON`)
  measure('year chart data + JSON, one site (78° N, 2027)', 30, 150, () => JSON.stringify(computeYearChart(KVITFJELL)))
  measure('run-up, one site (78° N, 190 days back + 400 ahead)', 30, null, () => computeRunup({ ...KVITFJELL, from: '2026-09-20', minCivilHours: 4 }))
}

// Six demo crew people, each with an extra shift every fourth day of the window (invented, bench only).
function addBusyRoster(db: AppDatabase, personIds: number[], siteId: number, fromMs: number) {
  db.transaction((tx) => {
    for (let day = 0; day < 30; day++) {
      personIds.forEach((personId, k) => {
        if ((day + k) % 4 !== 0) return
        const startMs = fromMs + day * 86_400_000 + (6 + ((day * 5 + k * 3) % 14)) * 3_600_000
        const row = tx.insert(shifts).values({ siteId, title: `Bench roster ${day}-${k}`, startAt: new Date(startMs), endAt: new Date(startMs + 4 * 3_600_000), light: 'any' }).returning({ id: shifts.id }).get()
        tx.insert(shiftAssignees).values({ shiftId: row.id, personId }).run()
      })
    }
  })
}

function benchSlotSearch() {
  const dir = mkdtempSync(join(tmpdir(), 'gloamline-bench-'))
  try {
    const db = openDatabase(join(dir, 'bench.sqlite'))
    applyMigrations(db, resolve(import.meta.dirname, '../drizzle'))
    const now = Date.now()
    seedDemoScenario(db, 'bench-not-a-real-hash', now)
    const site = db.select().from(sites).all().find(s => s.name === 'Ravnvik Pipeline Yard')!
    const crewIds = db.select({ id: people.id, role: people.role }).from(people).all().filter(p => p.role === 'crew').slice(0, 6).map(p => p.id)
    const from = addDays(localDateOf(now, site.timezone), 1)
    addBusyRoster(db, crewIds, site.id, localMidnightMs(from, site.timezone))
    const body = { siteId: site.id, durationMinutes: 180, light: 'civil' as const, from, to: addDays(from, 29), assigneeIds: crewIds, rank: 'earliest' as const, perDay: 1 }
    const sample = searchSlots(db, body, now)
    console.log(`slot search sample: ${sample.slots.length} slots on ${sample.daysWithSlots} of ${sample.daysSearched} days${sample.reason ? ` (${sample.reason})` : ''}`)
    measure('slot search, 30 days, crew of 6, civil light, 3 h', 30, 200, () => searchSlots(db, body, now))
    measure('slot search, same, any 4 of the 6, ranked by margin, 4 a day', 30, 200, () => searchSlots(db, { ...body, headcount: 4, rank: 'margin', perDay: 4 }, now))
    measure('light board, every demo site (next-change cache warm)', 30, null, () => loadLightBoard(db, now, 4))
    db.$client.close()
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}

async function measureAsync(label: string, runs: number, target: number | null, fn: () => Promise<unknown>) {
  for (let i = 0; i < 3; i++) await fn()
  const times: number[] = []
  for (let i = 0; i < runs; i++) {
    const t = performance.now()
    await fn()
    times.push(performance.now() - t)
  }
  times.sort((a, b) => a - b)
  const pick = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))]!
  const verdict = target === null ? '' : `  target < ${target} ms: ${pick(0.95) < target ? 'met' : 'NOT met'} (p95)`
  console.log(`${label.padEnd(58)} median ${pick(0.5).toFixed(1).padStart(6)} ms  p95 ${pick(0.95).toFixed(1).padStart(6)} ms  max ${times[times.length - 1]!.toFixed(1).padStart(6)} ms  (${runs} runs)${verdict}`)
}

// The same two over HTTP against the built server (GLOAMLINE_OUTPUT_DIR or .output), when there is one.
async function benchOverHttp() {
  if (!existsSync(resolve(OUTPUT_DIR, 'server/index.mjs'))) {
    console.log(`over HTTP: skipped, no built server in ${OUTPUT_DIR} (run nuxt build first)`)
    return
  }
  const server = await startAppServer()
  try {
    const client = await signedInClient(server, 'coordinator@gloamline.test')
    const list = (await client.get('/api/sites')).body as { id: number, name: string, timezone: string }[]
    const kvitfjell = list.find(s => s.name === 'Kvitfjell Ice Camp')!
    const ravnvik = list.find(s => s.name === 'Ravnvik Pipeline Yard')!
    const crewIds = ((await client.get('/api/people')).body as { id: number, role: string }[]).filter(p => p.role === 'crew').slice(0, 6).map(p => p.id)
    const from = addDays(localDateOf(Date.now(), ravnvik.timezone), 1)
    await measureAsync('GET /api/sites/:id/year (78° N), built server over HTTP', 30, 150, () => client.get(`/api/sites/${kvitfjell.id}/year?year=2027`))
    const search = { siteId: ravnvik.id, durationMinutes: 180, light: 'civil', from, to: addDays(from, 29), assigneeIds: crewIds }
    const sample = await client.post('/api/slots/search', search)
    console.log(`over HTTP: slot search answers ${sample.status} with ${sample.body.slots?.length ?? 0} slots for ${crewIds.length} people (demo roster)`)
    await measureAsync('POST /api/slots/search, 30 days, crew of 6, over HTTP', 30, 200, () => client.post('/api/slots/search', search))
  } catch (err) {
    console.log(`over HTTP: not measured (${(err as Error).message.split('\n')[0]})`)
  } finally {
    await server.stop()
  }
}

/** Prints the outlook figures: year chart, run-up, slot search and light board timings, in process and over HTTP. */
export async function runOutlookBench() {
  benchYearChart()
  benchSlotSearch()
  await benchOverHttp()
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await runOutlookBench()
