// The private calendar feed, read back with a general iCalendar parser (ical.js 2.2.1, RFC 5545).
// Its events must match the person's shifts in the database, in UTC, including across the two
// daylight-saving changes of Europe/Oslo (EU rule, Directive 2000/84/EC: summer time runs from 01:00
// UTC on the last Sunday of March to 01:00 UTC on the last Sunday of October). Sunrise events are
// checked against astronomy-engine 2.1.19's SearchRiseSet, within 2 minutes.
import Database from 'better-sqlite3'
import ICAL from 'ical.js'
import { Body, Observer, SearchRiseSet } from 'astronomy-engine'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ApiClient, AppServer } from '../support/app-server'
import { signedInClient, startAppServer } from '../support/app-server'

let server: AppServer
let coordinator: ApiClient
let crew: ApiClient
let crewId: number
let ravnvik: { id: number, name: string, latitude: number, longitude: number, timezone: string }
const created: Record<string, number> = {}

beforeAll(async () => {
  server = await startAppServer({ env: { REMINDER_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  crew = await signedInClient(server, 'crew@gloamline.test')
  crewId = (await crew.get('/api/auth/me')).body.user.id
  ravnvik = (await coordinator.get('/api/sites')).body.find((s: any) => s.timezone === 'Europe/Oslo' && s.latitude > 69)
  // two night shifts over the 2027 clock changes in Europe/Oslo, given as local wall-clock times
  const plans = {
    autumn: { start: '2027-10-30T22:00', end: '2027-10-31T06:00' },
    spring: { start: '2027-03-27T23:00', end: '2027-03-28T05:00' }
  }
  for (const [name, times] of Object.entries(plans)) {
    const reply = await coordinator.post('/api/shifts', { siteId: ravnvik.id, title: `Night valve check (${name})`, light: 'any', assigneeIds: [crewId], overrideReason: 'feed test', ...times })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    created[name] = reply.body.id
  }
  // and one in three days at the site nearest the equator, where the sun rises and sets in any season
  const sunny = (await coordinator.get('/api/sites')).body.sort((a: any, b: any) => Math.abs(a.latitude) - Math.abs(b.latitude))[0]
  const day = new Date(server.clock.now() + 3 * 86_400_000).toISOString().slice(0, 10)
  const soon = await coordinator.post('/api/shifts', { siteId: sunny.id, title: 'Line patrol (feed test)', light: 'civil', assigneeIds: [crewId], overrideReason: 'feed test', start: `${day}T10:00`, end: `${day}T12:00` })
  expect(soon.status, JSON.stringify(soon.body)).toBe(201)
})
afterAll(async () => {
  await server?.stop()
})

async function fetchFeed(url: string) {
  const res = await fetch(url)
  return { status: res.status, type: res.headers.get('content-type'), text: await res.text() }
}

function parseEvents(text: string) {
  const calendar = new ICAL.Component(ICAL.parse(text))
  return calendar.getAllSubcomponents('vevent').map(v => ({ component: v, event: new ICAL.Event(v) }))
}

function shiftsOfCrewInDatabase() {
  const db = new Database(server.databasePath, { readonly: true })
  const rows = db.prepare(`select s.id, s.start_at as startAt, s.end_at as endAt, s.minutes_below as minutesBelow, s.site_id as siteId from shifts s
    join shift_assignees a on a.shift_id = s.id where a.person_id = ? and s.cancelled_at is null and s.end_at > ?`).all(crewId, server.clock.now() - 60 * 86_400_000) as { id: number, startAt: number, endAt: number, minutesBelow: number, siteId: number }[]
  db.close()
  return rows
}

describe('the calendar feed', () => {
  it('is fetched without a session and parses as iCalendar, one event per shift, in UTC', async () => {
    const { url } = (await crew.get('/api/me/feed')).body
    expect(url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/feed\/[A-Za-z0-9_-]{43}\.ics$/)
    const feed = await fetchFeed(url)
    expect(feed.status).toBe(200)
    expect(feed.type).toMatch(/^text\/calendar/)
    const events = parseEvents(feed.text)
    const expected = shiftsOfCrewInDatabase()
    expect(events.map(e => e.event.uid).sort()).toEqual(expected.map(s => `shift-${s.id}@gloamline`).sort())
    const sites = (await crew.get('/api/sites')).body as { id: number, name: string, latitude: number, longitude: number }[]
    for (const shift of expected) {
      const { event, component } = events.find(e => e.event.uid === `shift-${shift.id}@gloamline`)!
      expect(event.startDate.toJSDate().getTime()).toBe(shift.startAt)
      expect(event.endDate.toJSDate().getTime()).toBe(shift.endAt)
      expect(event.startDate.zone.tzid).toBe('UTC')
      const site = sites.find(s => s.id === shift.siteId)!
      expect(event.summary).toContain(site.name)
      expect(event.location).toBe(site.name)
      // RFC 5545 §3.8.1.6: GEO is latitude;longitude
      expect(component.getFirstPropertyValue('geo')).toEqual([site.latitude, site.longitude])
      expect(event.description).toContain(`Minutes below its light need: ${shift.minutesBelow}`)
      expect(event.description).toMatch(/Safety review: /)
    }
  })

  it('keeps the right instants and lengths across both daylight-saving changes', async () => {
    const { url } = (await crew.get('/api/me/feed')).body
    const events = parseEvents((await fetchFeed(url)).text)
    const autumn = events.find(e => e.event.uid === `shift-${created.autumn}@gloamline`)!.event
    const spring = events.find(e => e.event.uid === `shift-${created.spring}@gloamline`)!.event
    // 22:00 CEST (UTC+2) → 06:00 CET (UTC+1): 20:00Z → 05:00Z, 9 hours (the night has 25)
    expect(autumn.startDate.toJSDate().toISOString()).toBe('2027-10-30T20:00:00.000Z')
    expect(autumn.endDate.toJSDate().toISOString()).toBe('2027-10-31T05:00:00.000Z')
    expect(autumn.duration.toSeconds()).toBe(9 * 3600)
    // 23:00 CET (UTC+1) → 05:00 CEST (UTC+2): 22:00Z → 03:00Z, 5 hours (the night has 23)
    expect(spring.startDate.toJSDate().toISOString()).toBe('2027-03-27T22:00:00.000Z')
    expect(spring.endDate.toJSDate().toISOString()).toBe('2027-03-28T03:00:00.000Z')
    expect(spring.duration.toSeconds()).toBe(5 * 3600)
    expect(autumn.description).toContain('UTC+02:00 → UTC+01:00 (clocks change)')
  })

  // docs/api.md: STATUS:CANCELLED for a cancelled shift (RFC 5545 3.8.1.11), so a calendar that holds it drops it
  it('keeps a cancelled shift as CANCELLED, so calendars that hold it drop it', async () => {
    expect((await coordinator.delete(`/api/shifts/${created.spring}`)).status).toBe(200)
    const { url } = (await crew.get('/api/me/feed')).body
    const events = parseEvents((await fetchFeed(url)).text)
    const status = (id: number) => events.find(e => e.event.uid === `shift-${id}@gloamline`)?.component.getFirstPropertyValue('status')
    expect(status(created.spring!)).toBe('CANCELLED')
    expect(status(created.autumn!)).not.toBe('CANCELLED')
  })

  it('adds sunrise and sunset for the person\'s sites over 14 days when asked, matching astronomy-engine', async () => {
    expect((await crew.patch('/api/me/preferences', { feedIncludeSun: true })).body.feedIncludeSun).toBe(true)
    const { url } = (await crew.get('/api/me/feed')).body
    const events = parseEvents((await fetchFeed(url)).text)
    const sun = events.filter(e => /^(Sunrise|Sunset) at /.test(e.event.summary))
    expect(sun.length).toBeGreaterThan(0)
    const sites = (await crew.get('/api/sites')).body as { name: string, latitude: number, longitude: number }[]
    let checked = 0
    for (const { event, component } of sun.filter(e => e.event.summary.startsWith('Sunrise')).slice(0, 10)) {
      const site = sites.find(s => event.summary === `Sunrise at ${s.name}`)!
      const at = event.startDate.toJSDate().getTime()
      const ref = SearchRiseSet(Body.Sun, new Observer(site.latitude, site.longitude, 0), +1, new Date(at - 3 * 3_600_000), 1)
      expect(ref).not.toBeNull()
      expect(Math.abs(ref!.date.getTime() - at)).toBeLessThanOrEqual(2 * 60_000)
      expect(component.getFirstPropertyValue('transp')).toBe('TRANSPARENT')
      checked++
    }
    expect(checked).toBeGreaterThan(0)
    const last = Math.max(...sun.map(e => e.event.startDate.toJSDate().getTime()))
    expect(last - server.clock.now()).toBeLessThanOrEqual(15 * 86_400_000)
    await crew.patch('/api/me/preferences', { feedIncludeSun: false })
  })

  it('kills the old URL when the token is regenerated; a wrong token gets a 404 that says nothing', async () => {
    const old = (await crew.get('/api/me/feed')).body.url as string
    const again = (await crew.get('/api/me/feed')).body.url as string
    expect(again).toBe(old)
    const fresh = (await crew.post('/api/me/feed/regenerate')).body.url as string
    expect(fresh).not.toBe(old)
    expect((await fetchFeed(fresh)).status).toBe(200)
    const gone = await fetchFeed(old)
    const random = await fetchFeed(old.replace(/\/feed\/[^/]+$/, `/feed/${'A'.repeat(43)}.ics`))
    const malformed = await fetchFeed(old.replace(/\/feed\/[^/]+$/, '/feed/not-a-token'))
    for (const reply of [gone, random, malformed]) expect(reply.status).toBe(404)
    expect(gone.text).toBe(random.text)
    expect(gone.text).toBe(malformed.text)
    expect(gone.text).not.toMatch(/crew|Berthelsen|token|person/i)
    // another person's feed is another token
    const safety = await signedInClient(server, 'safety@gloamline.test')
    expect((await safety.get('/api/me/feed')).body.url).not.toBe(fresh)
  })

  it('stops answering for a deactivated person', async () => {
    const liv = (await coordinator.get('/api/people')).body.find((p: any) => p.email === 'liv.aasen@gloamline.test')
    const client = await signedInClient(server, 'liv.aasen@gloamline.test')
    const { url } = (await client.get('/api/me/feed')).body
    expect((await fetchFeed(url)).status).toBe(200)
    expect((await coordinator.patch(`/api/people/${liv.id}`, { active: false })).status).toBe(200)
    expect((await fetchFeed(url)).status).toBe(404)
  })
})

describe('preferences', () => {
  it('reads and changes reminders, display zone and sun events, refusing bad values by field', async () => {
    const client = await signedInClient(server, 'kalle.niemi@gloamline.test')
    expect((await client.get('/api/me/preferences')).body).toEqual({ remindersEnabled: true, displayZone: 'site', feedIncludeSun: false, units: 'metric' })
    const changed = await client.patch('/api/me/preferences', { displayZone: 'America/Nuuk', remindersEnabled: false })
    expect(changed.body).toEqual({ remindersEnabled: false, displayZone: 'America/Nuuk', feedIncludeSun: false, units: 'metric' })
    for (const [body, field] of [[{ displayZone: 'Mars/Olympus' }, 'displayZone'], [{ remindersEnabled: 'yes' }, 'remindersEnabled'], [{ colour: 'red' }, 'body']] as const) {
      const reply = await client.patch('/api/me/preferences', body)
      expect(reply.status).toBe(400)
      expect(JSON.stringify(reply.body.data.issues)).toContain(field === 'body' ? 'colour' : field)
    }
    expect((await client.get('/api/me/preferences')).body.displayZone).toBe('America/Nuuk')
    // the home then writes times in the chosen zone, and says so
    const today = (await client.get('/api/me/today')).body
    expect(today.sites[0].zone).toBe('America/Nuuk')
    expect(today.sites[0].days[0].solarNoon.at).toMatch(/-0[23]:00$/)
  })
})
