// Shared set-up for the safety review e2e tests: the built server with the local fake forecast
// server behind it (no test reaches the network), signed-in clients for the three demo roles, and an
// invented test site where a shift around midnight is always in the dark.
import Database from 'better-sqlite3'
import { startFakeForecastServer } from '../../scripts/fake-forecast.mjs'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from './app-server'
import { runningClock, TEST_CLOCK, utcDateOf } from './clock'

export interface SafetyWorld {
  server: AppServer
  fake: Awaited<ReturnType<typeof startFakeForecastServer>>
  coordinator: ApiClient
  safety: ApiClient
  crew: ApiClient
  stop: () => Promise<void>
}

// the clock of the world last started (the server's, which the fake forecast shares): "today" for dateFromToday
let worldNow: () => number = runningClock(TEST_CLOCK.weekdayMorning)

/**
 * Starts the fake forecast server and the app pointed at it, and signs in the demo accounts. Both
 * run on one test clock starting at `clockStart`, so the forecast covers the server's days.
 */
export async function startSafetyWorld(env: Record<string, string> = {}, clockStart: string = TEST_CLOCK.weekdayMorning): Promise<SafetyWorld> {
  worldNow = runningClock(clockStart)
  const fake = await startFakeForecastServer({ port: 0, now: worldNow })
  const server = await startAppServer({ clockStart, env: { FORECAST_BASE_URL: fake.url, FORECAST_TIMEOUT_MS: '800', ...env } })
  const [coordinator, safety, crew] = await Promise.all([
    signedInClient(server, 'coordinator@gloamline.test'),
    signedInClient(server, 'safety@gloamline.test'),
    signedInClient(server, 'crew@gloamline.test')
  ])
  return {
    server, fake, coordinator, safety, crew,
    stop: async () => {
      await server.stop()
      await fake.close()
    }
  }
}

/**
 * An invented site at 60° N on the prime meridian, zone UTC. At local solar midnight (about 00:00 UTC
 * there) the sun's altitude is at most 60° + 23.44° − 90° = −6.56° (common practice: lowest altitude
 * = latitude + declination − 90°), so a shift from 23:00 to 01:00 UTC is below civil light every night.
 */
export async function createDarkSite(coordinator: ApiClient, name: string) {
  const reply = await coordinator.post('/api/sites', { name, latitude: 60, longitude: 0, timezone: 'UTC' })
  if (reply.status !== 201) throw new Error(`site not created: ${reply.status} ${JSON.stringify(reply.body)}`)
  return reply.body as { id: number, name: string }
}

/** The UTC date `days` from the test clock's today (never the machine's date). */
export function dateFromToday(days: number): string {
  return utcDateOf(worldNow(), days)
}

/** The test clock's now, in ms (the server under test has the same). */
export function worldNowMs(): number {
  return worldNow()
}

/** A 23:00–01:00 UTC shift on the dark site, `daysAhead` days from today. */
export async function createDarkShift(coordinator: ApiClient, siteId: number, options: { daysAhead: number, assigneeIds: number[], title?: string, light?: 'daylight' | 'civil' }) {
  const start = `${dateFromToday(options.daysAhead)}T23:00:00Z`
  const end = `${dateFromToday(options.daysAhead + 1)}T01:00:00Z`
  const reply = await coordinator.post('/api/shifts', {
    siteId, title: options.title ?? 'Invented night task', start, end, light: options.light ?? 'civil', assigneeIds: options.assigneeIds
  })
  if (reply.status !== 201) throw new Error(`shift not created: ${reply.status} ${JSON.stringify(reply.body)}`)
  return reply.body as { id: number, version: number, reviewState: string, lightCheck: { flagged: boolean, minutesBelow: number } }
}

/** People of the demo by role, as ids. */
export async function findPeopleIds(client: ApiClient) {
  const people = (await client.get('/api/people')).body as { id: number, role: string, email: string }[]
  return {
    crew: people.filter(p => p.role === 'crew').map(p => p.id),
    byEmail: (email: string) => people.find(p => p.email === email)!.id
  }
}

/** Runs a read-only query on the server's database file (another connection; WAL lets it read). */
export function queryDatabase<T>(server: AppServer, sql: string, ...params: unknown[]): T[] {
  const db = new Database(server.databasePath, { readonly: true, fileMustExist: true })
  try {
    return db.prepare(sql).all(...params) as T[]
  } finally {
    db.close()
  }
}
