// Moon layer benchmark: `node --import tsx bench/moon.bench.ts` (or via `npm run bench`).
// Times a site-year (365 local days) of the moon's up spans, rises and sets at 69.6°N and 78.2°N with
// our finder (suncalc positions, 20-minute grid, Brent refinement) and, as the peer in the same run,
// astronomy-engine's own SearchAltitude for every moonrise and moonset of the year at the same
// −0.833° centre altitude. Target (ours): under 300 ms per site-year, so a full-year light request
// (at most 366 days) with the moon stays under a third of a second. Numbers are printed, never asserted.
import { Body, MakeTime, Observer, SearchAltitude } from 'astronomy-engine'
import { pathToFileURL } from 'node:url'
import { computeMoonDaysMs } from '../server/core/light/moon'

const YEAR = 2027
const RUNS = 5
const DAY_MS = 86_400_000
const TARGET_MS = 300
const SITES = [
  { name: '69.6°N', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
  { name: '78.2°N', latitude: 78.22, longitude: 15.63, timezone: 'Europe/Oslo' }
]

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

function timeRuns(fn: () => number): { ms: number, count: number } {
  const times: number[] = []
  let count = 0
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now()
    count = fn()
    times.push(performance.now() - t0)
  }
  return { ms: median(times), count }
}

function referenceCrossings(latitude: number, longitude: number): number {
  const observer = new Observer(latitude, longitude, 0)
  const from = Date.UTC(YEAR, 0, 1)
  const to = Date.UTC(YEAR + 1, 0, 1)
  let count = 0
  for (const direction of [1, -1]) {
    let t = MakeTime(new Date(from))
    for (;;) {
      const found = SearchAltitude(Body.Moon, observer, direction, t, (to - t.date.getTime()) / DAY_MS, -0.833)
      if (!found) break
      count++
      t = found.AddDays(1 / 86_400)
    }
  }
  return count
}

export function runMoonBench() {
  console.log(`moon layer, site-year ${YEAR}: median of ${RUNS} runs; Node ${process.version}`)
  for (const site of SITES) {
    const ours = timeRuns(() => computeMoonDaysMs({ ...site, from: `${YEAR}-01-01`, to: `${YEAR}-12-31` }).reduce((n, d) => n + d.events.length, 0))
    const peer = timeRuns(() => referenceCrossings(site.latitude, site.longitude))
    console.log(`  ${site.name}: ours ${ours.ms.toFixed(1)} ms (target < ${TARGET_MS} ms), ${ours.count} rises and sets · astronomy-engine SearchAltitude ${peer.ms.toFixed(1)} ms, ${peer.count}`)
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) runMoonBench()
