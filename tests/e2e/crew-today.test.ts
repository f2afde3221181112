// The crew home's data (GET /api/me/today): the light window equals the light engine's own contract
// (GET /api/sites/:id/light), the change from the day before is the difference of its minutes, the
// review decision and its measures come through, and the stored forecast gives wind chill and cold
// cautions as the published tables have them: the 2001 wind chill index (NWS / ECCC formula, metric),
// the ECCC frostbite bands and the ACGIH 4-hour work/warm-up schedule (docs/references.md).
import { createHash } from 'node:crypto'
import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

let server: AppServer
let crew: ApiClient
// a shift made for this test: tomorrow (UTC date), 2 hours in a stretch of that day with the sun down
let fixture: { id: number, siteId: number, minutesBelow: number }

// The first site and stretch of at least 3 hours without daylight on a date, read from the light
// engine's contract, so the test does not depend on the season or the demo's shifts.
async function findSunDownWindow(client: ApiClient, date: string) {
  for (const site of (await client.get('/api/sites')).body) {
    const [day] = (await client.get(`/api/sites/${site.id}/light?from=${date}&to=${date}`)).body.days
    const dark = day.periods.find((p: any) => p.kind !== 'day' && Date.parse(p.end) - Date.parse(p.start) >= 3 * 3_600_000)
    if (dark) return { siteId: site.id as number, startMs: Date.parse(dark.start) + 30 * 60_000 }
  }
  throw new Error(`no site has 3 hours without daylight on ${date}`)
}

beforeAll(async () => {
  // a Sunday morning in the southern summer: tomorrow is a Monday, dark hours only in the north
  server = await startAppServer({ clockStart: TEST_CLOCK.southernSummerSunday, env: { REMINDER_TIMER: 'off' } })
  crew = await signedInClient(server, 'crew@gloamline.test')
  const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  const crewId = (await crew.get('/api/auth/me')).body.user.id
  const tomorrow = new Date(server.clock.now() + 86_400_000).toISOString().slice(0, 10)
  const window = await findSunDownWindow(coordinator, tomorrow)
  const reply = await coordinator.post('/api/shifts', {
    siteId: window.siteId, title: 'Beacon battery swap', light: 'daylight', assigneeIds: [crewId], overrideReason: 'test fixture',
    start: new Date(window.startMs).toISOString(), end: new Date(window.startMs + 2 * 3_600_000).toISOString()
  })
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  fixture = { id: reply.body.id, siteId: window.siteId, minutesBelow: reply.body.lightCheck.minutesBelow }
})
afterAll(async () => {
  await server?.stop()
})

// the moment a light row prints, to the nearest minute, as an ISO minute
function minuteOf(iso: string) {
  return new Date(Math.round(Date.parse(iso) / 60_000) * 60_000).toISOString()
}

describe('the crew member\'s today', () => {
  it('lists the sites of the next 7 days with today and tomorrow as the light engine computes them', async () => {
    const today = (await crew.get('/api/me/today')).body
    expect(today.basis).toBe('shifts')
    expect(today.sites.length).toBeGreaterThan(0)
    for (const site of today.sites) {
      expect(site.days.map((d: any) => d.which)).toEqual(['today', 'tomorrow'])
      const [first, second] = site.days
      const from = new Date(Date.parse(first.date) - 86_400_000).toISOString().slice(0, 10)
      const light = (await crew.get(`/api/sites/${site.id}/light?from=${from}&to=${second.date}`)).body.days
      expect(light.map((d: any) => d.date)).toEqual([from, first.date, second.date])
      site.days.forEach((day: any, i: number) => {
        const ref = light[i + 1]
        expect(day.status).toBe(ref.status)
        expect(day.daylightMinutes).toBe(ref.daylightMinutes)
        expect(day.civilLightMinutes).toBe(ref.civilLightMinutes)
        expect(day.daylightChange).toBe(ref.daylightMinutes - light[i].daylightMinutes)
        expect(day.civilLightChange).toBe(ref.civilLightMinutes - light[i].civilLightMinutes)
        for (const [key, type] of [['sunrise', 'sunrise'], ['sunset', 'sunset'], ['civilDawn', 'civil-dawn'], ['civilDusk', 'civil-dusk']] as const) {
          expect(day[key].map((m: any) => minuteOf(m.at)), `${site.name} ${day.date} ${key}`).toEqual(ref.events.filter((e: any) => e.type === type).map((e: any) => minuteOf(e.at)))
        }
        expect(day.solarNoon.at).toBe(ref.solarNoon)
      })
    }
  })

  it('shows each shift\'s light state and the review decision with its measures', async () => {
    const before = (await crew.get('/api/me/today')).body
    const flagged = before.sites.flatMap((s: any) => s.days.flatMap((d: any) => d.shifts)).find((s: any) => s.id === fixture.id)
    expect(fixture.minutesBelow).toBe(120)
    expect(flagged).toMatchObject({ flagged: true, reviewState: 'pending', minutesBelow: 120, lightState: 'Short of its light need for 2 h' })
    expect(flagged.alone).toBe(true)
    expect(flagged.cautions.map((c: any) => c.key)).toEqual(expect.arrayContaining(['below-light', 'working-alone']))
    const safety = await signedInClient(server, 'safety@gloamline.test')
    const decided = await safety.post(`/api/shifts/${flagged.id}/review`, { decision: 'approved', mitigations: ['portable-lighting', 'two-person-minimum'], note: 'Head torches checked at the hut' })
    expect(decided.status, JSON.stringify(decided.body)).toBe(201)
    const after = (await crew.get('/api/me/today')).body
    const shift = after.sites.flatMap((s: any) => s.days.flatMap((d: any) => d.shifts)).find((s: any) => s.id === flagged.id)
    expect(shift.reviewState).toBe('approved')
    expect(shift.reviewWords).toBe('Approved by Tomas Reyes')
    expect(shift.mitigations).toEqual(['Portable work lighting on site', 'At least two people on the task at all times'])
    expect(shift.reviewNote).toBe('Head torches checked at the hut')
  })

  it('reads the stored forecast: wind chill, frostbite band and warm-up schedule as published', async () => {
    const today = (await crew.get('/api/me/today')).body
    const site = today.sites.find((s: any) => s.id === fixture.siteId)
    const start = Date.parse(`${site.days[0].date}T00:00:00Z`) - 86_400_000
    const hours = Array.from({ length: 96 }, (_, i) => ({ at: new Date(start + i * 3_600_000).toISOString(), temperatureC: -30, windKmh: 30, gustKmh: 45 }))
    const db = new Database(server.databasePath)
    db.prepare('insert into forecasts (site_id, source, status, fetched_at, hours) values (?, ?, ?, ?, ?)').run(site.id, 'test fixture', 'ok', server.clock.now(), JSON.stringify(hours))
    db.close()
    const after = (await crew.get('/api/me/today')).body.sites.find((s: any) => s.id === site.id)
    expect(after.forecastNote).toMatch(/^Forecast fetched /)
    // NWS / ECCC 2001 metric: 13.12 + 0.6215·(−30) − 11.37·30^0.16 + 0.3965·(−30)·30^0.16 = −45.6 → −46
    // (ECCC's chart prints −46 at −30 °C and 30 km/h; chart value from memory, the formula is the source)
    for (const day of after.days) {
      expect(day.weather).toContain('wind chill down to −46')
      // ECCC band −40 to −47: exposed skin can freeze in 5 to 10 minutes
      expect(day.weather).toContain('within 5 to 10 minutes')
    }
    const shift = after.days.flatMap((d: any) => d.shifts).find((s: any) => s.id === fixture.id)
    // ACGIH schedule, row −29 to −31 °C, column 32 km/h (wind read up to the next column): 30 minutes of work, 5 warm-up breaks
    const warmup = shift.cautions.find((c: any) => c.key === 'cold-warmup')
    expect(warmup.title).toBe('Cold: work at most 30 min between warm-up breaks')
    expect(warmup.figure).toMatch(/^5 warm-up breaks of 10 min in 4 hours/)
    expect(shift.cautions.map((c: any) => c.key)).toContain('frostbite')
    expect(shift.weather).toContain('Coldest −30 °C, wind up to 30 km/h, gusts 45 km/h; wind chill down to −46')
    // the other sites have no forecast, and say so
    const others = (await crew.get('/api/me/today')).body.sites.filter((s: any) => s.id !== site.id)
    for (const other of others) expect(other.forecastNote).toBe('No forecast for this site yet.')
  })

  it('shows every site, and says why, to someone with no shifts in the next 7 days', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const invited = await coordinator.post('/api/invitations', { name: 'Tuva Berg', email: 'tuva.berg@northwake.test', role: 'crew' })
    expect(invited.status).toBe(201)
    const db = new Database(server.databasePath)
    const token = 'fixture-token-for-tuva-berg-0123456789'
    // a known token for this fixture: its hash replaces the mailed one (the mail path is tested elsewhere)
    db.prepare('update invitations set token_hash = ? where person_id = ?').run(createHash('sha256').update(token).digest('hex'), invited.body.person.id)
    db.close()
    const tuva = new ApiClient(server.url)
    expect((await tuva.post('/api/auth/invitation', { token, password: 'fjord-lantern-basalt-7' })).status).toBe(200)
    const today = (await tuva.get('/api/me/today')).body
    const sites = (await tuva.get('/api/sites')).body
    expect(today.basis).toBe('all-sites')
    expect(today.basisNote).toBe('You have no shifts in the next 7 days, so every site is shown.')
    expect(today.sites.map((s: any) => s.id).sort()).toEqual(sites.map((s: any) => s.id).sort())
    expect(today.sites.every((s: any) => s.days.every((d: any) => d.shifts.length === 0))).toBe(true)
  })

  it('needs a session', async () => {
    expect((await new ApiClient(server.url).get('/api/me/today')).status).toBe(401)
  })
})
