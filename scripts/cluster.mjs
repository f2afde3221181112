// Serves the built server (.output/server/index.mjs, or the folder GLOAMLINE_OUTPUT_DIR names) as a
// cluster of worker processes sharing one port (node:cluster), one per core unless GLOAMLINE_WORKERS
// says otherwise. `npm start` runs this; `node .output/server/index.mjs` still serves one process.
//
// Worker 0 starts first and alone: it applies the migrations and seeds the demo, and it alone runs
// the timed jobs (reminders, forecast refresh; GLOAMLINE_WORKER=0). The others start once it
// listens, with SEED_DEMO=0. A worker that dies is started again with the same number. Reply caches
// stay correct across workers: each keys its replies by a data stamp that moves on any commit by any
// connection (server/utils/response-cache.ts).
import cluster from 'node:cluster'
import { availableParallelism } from 'node:os'
import { join, resolve } from 'node:path'

const root = resolve(import.meta.dirname, '..')
const entry = join(resolve(root, process.env.GLOAMLINE_OUTPUT_DIR || '.output'), 'server', 'index.mjs')
const requested = Number(process.env.GLOAMLINE_WORKERS)
const count = Number.isInteger(requested) && requested > 0 ? requested : availableParallelism()
// a worker that keeps dying at start is not restarted in a tight loop
const RESTART_DELAY_MS = 1_000

cluster.setupPrimary({ exec: entry })
let stopping = false

function fork(index) {
  const env = { GLOAMLINE_WORKER: String(index) }
  if (index > 0) env.SEED_DEMO = '0'
  const worker = cluster.fork(env)
  worker.on('exit', (code, signal) => {
    if (stopping) return
    console.error(`[gloamline] worker ${index} exited (${signal ?? code}); starting it again`)
    setTimeout(() => fork(index), RESTART_DELAY_MS)
  })
  return worker
}

const first = fork(0)
first.once('listening', () => {
  for (let i = 1; i < count; i++) fork(i)
  console.info(`[gloamline] ${count} worker${count === 1 ? '' : 's'} serving ${entry}`)
})

for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => {
    stopping = true
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill(signal)
    setTimeout(() => process.exit(0), 5_000).unref()
    cluster.on('exit', () => {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0)
    })
  })
}
