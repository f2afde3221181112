// Light engine benchmark: `node --import tsx bench/light.bench.ts` (or via `npm run bench`).
// For 0°, 60°N, 78°N and 89.5°S it times a full site-year (365 local days, ISO strings and time-zone
// work included) with our engine, the same partition from astronomy-engine's own searches
// (SearchAltitude for every threshold crossing, SearchHourAngle for the daily extremes), and suncalc's
// getTimes called once per local day (which cannot produce a partition at high latitude, shown for
// scale only); then checks 10,000 random shifts. Numbers are printed, never asserted.
import { Body, MakeTime, Observer, SearchAltitude, SearchHourAngle } from 'astronomy-engine'
import { fromZonedTime } from 'date-fns-tz'
import { getTimes } from 'suncalc'
import { pathToFileURL } from 'node:url'
import { computeLightDays, computeLightDaysMs } from '../server/core/light/index'
import { clearTimeZoneCache } from '../server/core/time/zone-table'
import { checkShiftLight } from '../server/core/light/check'
import { LIGHT_REQUIREMENT_KINDS } from '../shared/light'

const THRESHOLDS = [-18, -12, -6, -0.833]
const KINDS = ['night', 'astronomical', 'nautical', 'civil', 'day']
const DAY_MS = 86_400_000
const YEAR = 2026

interface BenchSite { name: string, latitude: number, longitude: number, timezone: string }

const SITES: BenchSite[] = [
  { name: '0°', latitude: 0, longitude: 0, timezone: 'UTC' },
  { name: '60°N', latitude: 60, longitude: 10.75, timezone: 'Europe/Oslo' },
  { name: '78°N', latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' },
  { name: '89.5°S', latitude: -89.5, longitude: 0, timezone: 'Antarctica/McMurdo' }
]

function localDates(year: number): string[] {
  const dates: string[] = []
  for (let ms = Date.UTC(year, 0, 1); ms < Date.UTC(year + 1, 0, 1); ms += DAY_MS) dates.push(new Date(ms).toISOString().slice(0, 10))
  return dates
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

interface Timing {
  /** Median wall-clock time of one run, ms. */
  wall: number
  /** Mean CPU time (user + system) of one run, ms: less disturbed when other work shares the machine. */
  cpu: number
}

function timeRuns(runs: number, fn: () => void): Timing {
  const times: number[] = []
  const cpu0 = process.cpuUsage()
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now()
    fn()
    times.push(performance.now() - t0)
  }
  const cpu = process.cpuUsage(cpu0)
  return { wall: median(times), cpu: (cpu.user + cpu.system) / 1000 / runs }
}

function formatTiming(t: Timing): string {
  return `${t.wall.toFixed(2)} ms (cpu ${t.cpu.toFixed(2)})`
}

// The same site-year partition from astronomy-engine: every crossing by SearchAltitude, every
// meridian passage by SearchHourAngle, local midnights by date-fns-tz, then cut into days.
function partitionWithAstronomyEngine(site: BenchSite) {
  const observer = new Observer(site.latitude, site.longitude, 0)
  const dates = localDates(YEAR)
  const bounds = [...dates, `${YEAR + 1}-01-01`].map(d => fromZonedTime(`${d}T00:00:00`, site.timezone).getTime())
  const from = bounds[0]!
  const to = bounds[bounds.length - 1]!
  const crossings: { ms: number, band: number }[] = []
  THRESHOLDS.forEach((threshold, level) => {
    for (const direction of [1, -1]) {
      let t = MakeTime(new Date(from))
      for (;;) {
        const found = SearchAltitude(Body.Sun, observer, direction, t, (to - t.date.getTime()) / DAY_MS, threshold)
        if (!found) break
        crossings.push({ ms: found.date.getTime(), band: direction === 1 ? level + 1 : level })
        t = found.AddDays(1 / 86_400)
      }
    }
  })
  for (const hourAngle of [0, 12]) {
    let t = MakeTime(new Date(from))
    for (let ms = from; ms < to;) {
      const found = SearchHourAngle(Body.Sun, observer, hourAngle, t, 1)
      ms = found.time.date.getTime()
      t = found.time.AddDays(0.5)
    }
  }
  crossings.sort((a, b) => a.ms - b.ms)
  let c = 0
  return dates.map((date, j) => {
    const kinds: string[] = []
    while (c < crossings.length && crossings[c]!.ms < bounds[j + 1]!) kinds.push(KINDS[crossings[c++]!.band]!)
    return { date, kinds }
  })
}

// suncalc's getTimes for each local date at its local noon; the Dates are made before the clock runs,
// so the peer is timed on its own work alone
function localNoons(site: BenchSite): Date[] {
  return localDates(YEAR).map(date => fromZonedTime(`${date}T12:00:00`, site.timezone))
}

function runSuncalcPerDay(site: BenchSite, noons: Date[]) {
  for (const noon of noons) getTimes(noon, site.latitude, site.longitude)
}

function benchSite(site: BenchSite) {
  const input = { latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from: `${YEAR}-01-01`, to: `${YEAR}-12-31` }
  for (let i = 0; i < 5; i++) computeLightDays(input)
  const cold = timeRuns(31, () => {
    clearTimeZoneCache()
    computeLightDays(input)
  })
  const warm = timeRuns(31, () => computeLightDays(input))
  const numeric = timeRuns(31, () => computeLightDaysMs(input))
  const astronomy = timeRuns(3, () => partitionWithAstronomyEngine(site))
  const noons = localNoons(site)
  for (let i = 0; i < 5; i++) runSuncalcPerDay(site, noons)
  const suncalc = timeRuns(31, () => runSuncalcPerDay(site, noons))
  const vsSuncalc = warm.wall <= suncalc.wall
  const vsAstronomy = astronomy.wall / warm.wall >= 100
  console.log(`${site.name.padEnd(6)} ours ${formatTiming(warm)} per site-year (zone tables cached); ${formatTiming(cold)} with them rebuilt each run; numeric variant ${formatTiming(numeric)}`)
  console.log(`${''.padEnd(6)} peer suncalc getTimes, same 365 days: ${formatTiming(suncalc)} (times only, no partition)   target ours ≤ suncalc: ${vsSuncalc ? 'met' : 'NOT met'} (${(suncalc.wall / warm.wall).toFixed(2)}×)`)
  console.log(`${''.padEnd(6)} peer astronomy-engine search: ${formatTiming(astronomy)} = ${(astronomy.wall / warm.wall).toFixed(0)}× ours (cpu ${(astronomy.cpu / warm.cpu).toFixed(0)}×)   target ≥ 100×: ${vsAstronomy ? 'met' : 'NOT met'}`)
  return { site: site.name, ours: cold, oursCached: warm, oursNumeric: numeric, astronomyEngine: astronomy, suncalcGetTimes: suncalc }
}

// A small deterministic generator, so every run checks the same shifts.
function makeRandom(seed: number) {
  let state = seed >>> 0
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return state / 2 ** 32
  }
}

function benchShifts(count: number) {
  const random = makeRandom(20261201)
  const shifts = Array.from({ length: count }, () => {
    const startMs = Date.UTC(YEAR, 0, 1) + Math.floor(random() * 365 * 96) * 15 * 60_000
    return {
      latitude: (random() < 0.5 ? -1 : 1) * (55 + random() * 34.9),
      longitude: -180 + random() * 360,
      startMs,
      endMs: startMs + (2 + Math.floor(random() * 13)) * 3_600_000,
      requirement: LIGHT_REQUIREMENT_KINDS[Math.floor(random() * 3)]!
    }
  })
  for (const shift of shifts.slice(0, 200)) checkShiftLight(shift)
  let flagged = 0
  const timing = timeRuns(1, () => {
    for (const shift of shifts) if (checkShiftLight(shift).flagged) flagged++
  })
  console.log(`shift light check: ${count} random shifts (2–14 h, 55–89.9° N and S) in ${formatTiming(timing)},`
    + ` ${(timing.wall * 1000 / count).toFixed(1)} µs each, ${flagged} flagged`)
  return { shifts: count, total: timing, flagged }
}

/** Runs the light benchmark and prints one line per figure; returns the figures. */
export function runLightBench() {
  console.log(`light engine, site-year ${YEAR} (365 local days, ISO strings included): median wall time and mean cpu time per run; Node ${process.version}`)
  const sites = SITES.map(benchSite)
  const shifts = benchShifts(10_000)
  return { sites, shifts }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) runLightBench()
