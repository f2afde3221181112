// Calendar feed benchmark: `node --import tsx bench/feed.bench.ts` (or via `npm run bench`).
// A person with 2,000 shifts in the feed's window (two invented sites at 69°N and 78°N): our feed
// rendered from the database (one SQL read, one light trace per site, our RFC 5545 writer), beside
// the peer ical-generator 10.2.0 (which wrote the feed before) serialising the same events. Then a
// feed of 10,000 shifts rendered in slices while a timer measures how long the event loop was held.
// Targets: 2,000 shifts under 300 ms (median); no stretch over 100 ms without other work let in.
import { mkdtempSync, rmSync } from 'node:fs'
import { monitorEventLoopDelay } from 'node:perf_hooks'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import ical from 'ical-generator'
import ICAL from 'ical.js'
import { applyMigrations, openDatabase, type AppDatabase } from '../server/utils/db'
import { people, sites, type Person } from '../server/db/schema'
import { renderPersonFeed } from '../server/services/feed'

const NOW_MS = Date.parse('2027-01-11T08:00:00Z')
const DAY_MS = 86_400_000
const FEED_TARGET_MS = 300
const BLOCK_TARGET_MS = 100

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

function seedPerson(db: AppDatabase, count: number): Person {
  const siteRows = db.insert(sites).values([
    { name: 'Bench yard 69N', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
    { name: 'Bench camp 78N', latitude: 78.22, longitude: 15.63, timezone: 'Arctic/Longyearbyen' }
  ]).returning().all()
  const [person, mate] = db.insert(people).values([
    { name: 'Bench Person', email: `bench-${count}@bench.test`, role: 'crew', feedIncludeSun: true },
    { name: 'Bench Mate', email: `mate-${count}@bench.test`, role: 'crew' }
  ]).returning().all()
  const shift = db.$client.prepare('insert into shifts (site_id, title, start_at, end_at, light, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?)')
  const assign = db.$client.prepare('insert into shift_assignees (shift_id, person_id) values (?, ?)')
  // spread over the window the feed shows: 60 days back to two years ahead
  const stepMs = Math.floor((780 * DAY_MS) / count / 900_000) * 900_000
  db.$client.transaction(() => {
    for (let i = 0; i < count; i++) {
      const startMs = NOW_MS - 58 * DAY_MS + i * stepMs
      const id = Number(shift.run(siteRows[i % 2]!.id, `Bench task ${i + 1}`, startMs, startMs + (4 + (i % 6)) * 3_600_000, ['daylight', 'civil', 'any'][i % 3], NOW_MS, NOW_MS).lastInsertRowid)
      assign.run(id, person!.id)
      if (i % 2) assign.run(id, mate!.id)
    }
  })()
  return person!
}

// The peer: the same events (read back from our feed with ical.js) written by ical-generator.
function renderWithIcalGenerator(events: ICAL.Event[]) {
  const calendar = ical({ name: 'Gloamline shifts: Bench Person', prodId: { company: 'Gloamline', product: 'Shift feed', language: 'EN' }, ttl: 3600 })
  for (const e of events) {
    calendar.createEvent({ id: e.uid, start: e.startDate.toJSDate(), end: e.endDate.toJSDate(), summary: e.summary, description: e.description, location: e.location, stamp: new Date(NOW_MS) })
  }
  return calendar.toString()
}

export async function runFeedBench() {
  const dir = mkdtempSync(join(tmpdir(), 'gloamline-feed-bench-'))
  try {
    const db = openDatabase(join(dir, 'feed.sqlite'))
    applyMigrations(db, resolve(import.meta.dirname, '../drizzle'))
    const person = seedPerson(db, 2_000)
    for (let i = 0; i < 2; i++) await renderPersonFeed(db, person, { nowMs: NOW_MS })
    const ours: number[] = []
    let text = ''
    const cpu0 = process.cpuUsage()
    for (let i = 0; i < 9; i++) {
      const t0 = performance.now()
      text = await renderPersonFeed(db, person, { nowMs: NOW_MS })
      ours.push(performance.now() - t0)
    }
    const cpu = process.cpuUsage(cpu0)
    const oursCpu = (cpu.user + cpu.system) / 1000 / 9
    const events = new ICAL.Component(ICAL.parse(text)).getAllSubcomponents('vevent').map(v => new ICAL.Event(v)).filter(e => e.uid.startsWith('shift-'))
    const peer: number[] = []
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now()
      renderWithIcalGenerator(events)
      peer.push(performance.now() - t0)
    }
    const oursMedian = median(ours)
    console.log(`feed of ${events.length} shifts (${(text.length / 1024).toFixed(0)} KiB, sunrise and sunset included): ours median ${oursMedian.toFixed(0)} ms (cpu ${oursCpu.toFixed(0)} ms; database read, light, text)   target < ${FEED_TARGET_MS} ms: ${oursMedian < FEED_TARGET_MS ? 'met' : 'NOT met'}`)
    console.log(`${''.padEnd(6)} peer ical-generator writing the same ${events.length} events (text only): median ${median(peer).toFixed(0)} ms = ${(median(peer) / oursMedian).toFixed(1)}× ours`)

    const big = openDatabase(join(dir, 'feed-big.sqlite'))
    applyMigrations(big, resolve(import.meta.dirname, '../drizzle'))
    const busy = seedPerson(big, 10_000)
    const delay = monitorEventLoopDelay({ resolution: 5 })
    delay.enable()
    const t0 = performance.now()
    const bigText = await renderPersonFeed(big, busy, { nowMs: NOW_MS })
    const total = performance.now() - t0
    delay.disable()
    const heldMs = delay.max / 1e6
    console.log(`feed of 10,000 shifts (${(bigText.length / 1024 / 1024).toFixed(1)} MiB) rendered in slices in ${total.toFixed(0)} ms; longest hold of the event loop ${heldMs.toFixed(0)} ms   target < ${BLOCK_TARGET_MS} ms: ${heldMs < BLOCK_TARGET_MS ? 'met' : 'NOT met'}`)
    db.$client.close()
    big.$client.close()
    return { feedMs: oursMedian, peerMs: median(peer), heldMs }
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await runFeedBench()
