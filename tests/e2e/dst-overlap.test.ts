// Wall-clock shift times in an autumn overlap of any length take the earlier instant, with a note:
// Antarctica/Troll falls back 2 hours (UTC+2 → UTC+0), Australia/Lord_Howe 30 minutes (UTC+11 →
// UTC+10:30), Europe/Oslo 1 hour. The instants a wall time can mean are found from the IANA tz data
// through the runtime's Intl (every offset in 15-minute steps tried), never from memory; the
// property runs over every minute fast-check picks inside each overlap, through the running server.
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

const formatters = new Map<string, Intl.DateTimeFormat>()
function wallIn(ms: number, zone: string): string {
  if (!formatters.has(zone)) formatters.set(zone, new Intl.DateTimeFormat('en-CA', { timeZone: zone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit' }))
  return formatters.get(zone)!.format(new Date(ms)).replace(', ', 'T')
}

/** Every instant whose wall clock in `zone` reads `wall` (YYYY-MM-DDTHH:mm), earliest first. */
function instantsOf(wall: string, zone: string): number[] {
  const asUtc = Date.parse(`${wall}:00Z`)
  const out: number[] = []
  for (let offset = -14 * 60; offset <= 14 * 60; offset += 15) {
    const t = asUtc - offset * 60_000
    if (wallIn(t, zone) === wall) out.push(t)
  }
  return out.sort((a, b) => a - b)
}

/** The wall times of a local date that occur twice (the autumn overlap), per minute. */
function overlapMinutes(date: string, zone: string): string[] {
  const out: string[] = []
  for (let m = 0; m < 24 * 60; m++) {
    const wall = `${date}T${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`
    if (instantsOf(wall, zone).length === 2) out.push(wall)
  }
  return out
}

const CASES = [
  { zone: 'Antarctica/Troll', date: '2027-10-31', latitude: -72.01, longitude: 2.53, overlapMinutes: 120 },
  { zone: 'Australia/Lord_Howe', date: '2027-04-04', latitude: -31.55, longitude: 159.08, overlapMinutes: 30 },
  { zone: 'Europe/Oslo', date: '2027-10-31', latitude: 59.91, longitude: 10.75, overlapMinutes: 60 }
]

let server: AppServer
let coordinator: ApiClient
const siteIds = new Map<string, number>()

beforeAll(async () => {
  server = await startAppServer({ clockStart: TEST_CLOCK.fridayMidnightSun, env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  for (const c of CASES) {
    const site = await coordinator.post('/api/sites', { name: `Invented overlap site ${c.zone}`, latitude: c.latitude, longitude: c.longitude, timezone: c.zone })
    expect(site.status, JSON.stringify(site.body)).toBe(201)
    siteIds.set(c.zone, site.body.id)
  }
})
afterAll(async () => {
  await server?.stop()
})

describe('a wall-clock time in an autumn overlap', () => {
  for (const c of CASES) {
    it(`${c.zone} (${c.overlapMinutes} min overlap on ${c.date}): the earlier instant, with a note, for any minute of the overlap`, async () => {
      const overlap = overlapMinutes(c.date, c.zone)
      // the tz data as Intl has it: the overlap is as long as the zone's fall-back
      expect(overlap).toHaveLength(c.overlapMinutes)
      await fc.assert(fc.asyncProperty(fc.constantFrom(...overlap), async (wall) => {
        const [earlier, later] = instantsOf(wall, c.zone) as [number, number]
        expect(later - earlier).toBe(c.overlapMinutes * 60_000)
        const reply = await coordinator.post('/api/shifts', { siteId: siteIds.get(c.zone), title: `Overlap ${wall}`, light: 'any', assigneeIds: [], start: wall, end: `${c.date}T12:00` })
        expect(reply.status, JSON.stringify(reply.body)).toBe(201)
        expect(Date.parse(reply.body.start), wall).toBe(earlier)
        // the note says the time happens twice and which one was used
        expect(reply.body.timeNotes).toHaveLength(1)
        expect(reply.body.timeNotes[0]).toMatch(/happens twice/)
        expect(reply.body.timeNotes[0]).toContain(reply.body.start)
      }), { numRuns: 8 })
    })
  }
})
