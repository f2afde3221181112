// Rotation benchmarks: a rotation of 366 daily shifts made, light-checked and stored in one
// transaction (target: median under 500 ms), beside its peer, the same 366 shifts made one at a time
// through the ordinary shift service; and the review queue with 10 rotations of 100 waiting shifts
// each (target: median under 200 ms), beside its peer, the same 1,000 waiting shifts as single items.
// Prints figures; asserts nothing. Data: an invented site at 76°N and invented people (bench only).
import { resolve } from 'node:path'
import { isNull } from 'drizzle-orm'
import { applyMigrations, openDatabase, type AppDatabase } from '../server/utils/db'
import { people, shifts, sites } from '../server/db/schema'
import { createRotation, RotationBodySchema } from '../server/services/rotations'
import { createShift } from '../server/services/shift-writes'
import { ShiftBodySchema } from '../shared/schemas/shift'
import { buildReviewQueue, ReviewQueueQuerySchema } from '../server/services/reviews'
import { addDays } from '../shared/format'

const MIGRATIONS = resolve(import.meta.dirname, '../drizzle')
const SITE = { name: 'Bench Point 76N', latitude: 76.4, longitude: 16.2, timezone: 'Arctic/Longyearbyen' }
// the queue is read as if "now" were before every benched shift
const QUEUE_NOW = Date.parse('2027-01-01T00:00:00Z')

function median(times: number[]) {
  const sorted = [...times].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

function report(label: string, times: number[], target: number | null) {
  const m = median(times)
  const verdict = target === null ? '(peer, no target)' : `target median < ${target} ms: ${m < target ? 'met' : 'NOT met'}`
  console.log(`${label.padEnd(64)} median ${m.toFixed(1).padStart(7)} ms  max ${Math.max(...times).toFixed(1).padStart(7)} ms  (${times.length} runs)  ${verdict}`)
}

function freshDatabase() {
  const db = openDatabase(':memory:')
  applyMigrations(db, MIGRATIONS)
  const site = db.insert(sites).values(SITE).returning().get()
  const crew = db.insert(people).values([
    { name: 'Bench Coordinator', email: 'coord@rotation-bench.test', role: 'coordinator' },
    ...Array.from({ length: 20 }, (_, i) => ({ name: `Bench Crew ${i + 1}`, email: `crew${i + 1}@rotation-bench.test`, role: 'crew' as const }))
  ]).returning().all()
  return { db, siteId: site.id, actor: crew[0]!, crewIds: crew.slice(1).map(p => p.id) }
}

function timeOnce(run: () => void) {
  const t = performance.now()
  run()
  return performance.now() - t
}

function benchMake() {
  const times: number[] = []
  for (let i = 0; i < 12; i++) {
    const { db, siteId, actor, crewIds } = freshDatabase()
    const body = RotationBodySchema.parse({ siteId, title: 'Daily mast check', light: 'daylight', from: '2028-01-01', to: '2028-12-31', startTime: '09:00', endTime: '15:00', onDays: 1, offDays: 0, assigneeIds: crewIds.slice(0, 2) })
    const ms = timeOnce(() => createRotation(db, actor, body))
    if (i >= 2) times.push(ms)
    if (i === 2) console.log(`rotation: ${db.select().from(shifts).all().length} shifts stored, ${db.select().from(shifts).all().filter(s => s.flagged).length} flagged`)
    db.$client.close()
  }
  report('366 daily shifts as one rotation (make, check, store)', times, 500)

  const peer: number[] = []
  for (let i = 0; i < 3; i++) {
    const { db, siteId, actor, crewIds } = freshDatabase()
    peer.push(timeOnce(() => {
      for (let d = 0; d < 366; d++) {
        const date = addDays('2028-01-01', d)
        createShift(db, actor, ShiftBodySchema.parse({ siteId, title: 'Daily mast check', light: 'daylight', start: `${date}T09:00`, end: `${date}T15:00`, assigneeIds: crewIds.slice(0, 2) }))
      }
    }))
    db.$client.close()
  }
  report('peer: the same 366 shifts one at a time (shift service)', peer, null)
}

// 10 rotations of 100 daily shifts in polar night (every one flagged and waiting), 2 people each.
function queueDatabase() {
  const { db, siteId, actor, crewIds } = freshDatabase()
  for (let r = 0; r < 10; r++) {
    createRotation(db, actor, RotationBodySchema.parse({
      siteId, title: `Dark rotation ${r + 1}`, light: 'daylight', from: '2027-11-01', to: addDays('2027-11-01', 99),
      startTime: '10:00', endTime: '14:00', onDays: 1, offDays: 0, assigneeIds: crewIds.slice(r * 2, r * 2 + 2)
    }))
  }
  return db
}

function benchQueue(db: AppDatabase, label: string, target: number | null) {
  const query = ReviewQueueQuerySchema.parse({})
  const sample = buildReviewQueue(db, query, QUEUE_NOW)
  const items = sample.items.length + (sample.rotations?.length ?? 0)
  const times: number[] = []
  for (let i = 0; i < 25; i++) {
    const ms = timeOnce(() => JSON.stringify(buildReviewQueue(db, query, QUEUE_NOW)))
    if (i >= 5) times.push(ms)
  }
  report(`${label} (${items} items)`, times, target)
}

export function runRotationsBench() {
  benchMake()
  const db = queueDatabase()
  const waiting = db.select().from(shifts).all().filter(s => s.reviewState === 'pending').length
  console.log(`queue: ${waiting} waiting shifts in 10 rotations`)
  benchQueue(db, 'review queue, 10 rotations of 100 waiting shifts', 200)
  // the peer: the same shifts, no longer marked with their rotation, listed singly (first 50 shaped)
  db.update(shifts).set({ rotationId: null }).where(isNull(shifts.cancelledAt)).run()
  benchQueue(db, 'peer: the same 1,000 shifts as single items', null)
  db.$client.close()
}
