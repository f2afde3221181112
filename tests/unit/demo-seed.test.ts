// The demo scenario holds on any date: seeded at instants spread over a year (every weekday, both
// solstices, both equinoxes, the evenings before clock changes), the crew demo account has work
// tomorrow and every day of the coming two weeks holds both flagged and clear shifts. The "clear"
// and "flagged" come from our light check; the reason the night shift is flagged all year is
// checked against astronomy-engine 2.1.19 (the sun's geometric altitude at local midnight).
import { Body, Equator, Horizon, Observer } from 'astronomy-engine'
import { and, eq, isNull } from 'drizzle-orm'
import { afterEach, describe, expect, it } from 'vitest'
import { seedDemoScenario } from '../../server/db/seed'
import { people, shiftAssignees, shifts, sites } from '../../server/db/schema'
import { addCalendarDays, TEST_CLOCK, weekdayOf, zonedDateOf } from '../support/clock'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

afterEach(removeTestDatabases)

const INSTANTS = [
  ...Object.values(TEST_CLOCK),
  '2026-12-21T23:50:00Z', // Monday night, northern winter solstice
  '2027-06-20T08:00:00Z', // Sunday morning, northern summer solstice
  '2027-09-23T16:00:00Z', // Thursday, equinox
  '2027-10-30T22:30:00Z', // Saturday evening before Europe's clocks go back
  '2027-04-03T12:00:00Z', // Saturday before New Zealand's clocks go back
  '2027-08-10T03:00:00Z' // Tuesday, the sun back at the far-south site
]

function seededAt(iso: string) {
  const db = createTestDatabase('gloamline-seed-')
  const now = Date.parse(iso)
  expect(seedDemoScenario(db, 'not-a-real-hash', now)).toBe(true)
  const rows = db.select({ id: shifts.id, startAt: shifts.startAt, flagged: shifts.flagged, timezone: sites.timezone })
    .from(shifts).innerJoin(sites, eq(sites.id, shifts.siteId)).where(isNull(shifts.cancelledAt)).all()
  const assigned = db.select({ shiftId: shiftAssignees.shiftId, personId: shiftAssignees.personId }).from(shiftAssignees).all()
  const crewId = db.select({ id: people.id }).from(people).where(eq(people.email, 'crew@gloamline.test')).get()!.id
  const crewShiftIds = new Set(db.select({ id: shiftAssignees.shiftId }).from(shiftAssignees).where(and(eq(shiftAssignees.personId, crewId))).all().map(r => r.id))
  const peopleOf = (shiftId: number) => assigned.filter(a => a.shiftId === shiftId).map(a => a.personId)
  return { now, rows: rows.map(r => ({ ...r, date: zonedDateOf(r.startAt.getTime(), r.timezone), people: peopleOf(r.id) })), crewShiftIds }
}

describe('the demo scenario, seeded on any date', () => {
  it.each(INSTANTS)('seeded at %s: the crew account works tomorrow, every day of two weeks has flagged and clear work and at least 4 people at work', (iso) => {
    const { now, rows, crewShiftIds } = seededAt(iso)
    // the crew demo account's sites all use Svalbard's zone; "tomorrow" is the local date there
    const tomorrow = zonedDateOf(now, 'Arctic/Longyearbyen', 1)
    expect(rows.filter(r => crewShiftIds.has(r.id) && r.date === tomorrow).length, `crew work on ${tomorrow}`).toBeGreaterThan(0)
    const weekdays = new Set<number>()
    for (let day = 0; day < 14; day++) {
      const date = addCalendarDays(zonedDateOf(now, 'UTC'), day)
      const onDay = rows.filter(r => r.date === date)
      expect(onDay.some(r => r.flagged), `flagged work on ${date}`).toBe(true)
      expect(onDay.some(r => !r.flagged), `clear work on ${date}`).toBe(true)
      expect(new Set(onDay.flatMap(r => r.people)).size, `people at work on ${date}`).toBeGreaterThanOrEqual(4)
      weekdays.add(weekdayOf(date))
    }
    expect(weekdays.size).toBe(7)
  })

  it('the night outage work at Larsen Wharf (60.39° N, 22:00–02:00) is partly dark even on midsummer night, per astronomy-engine', () => {
    // the shortest night of 2027 there: 00:00 and 01:00 Europe/Oslo (UTC+2) on 21 June; the sun's
    // geometric altitude (no refraction) is below 0° at both, so a daylight task then is always flagged
    const observer = new Observer(60.3913, 5.3221, 5)
    for (const iso of ['2027-06-20T22:00:00Z', '2027-06-20T23:00:00Z']) {
      const time = new Date(iso)
      const sun = Equator(Body.Sun, time, observer, true, true)
      expect(Horizon(time, observer, sun.ra, sun.dec).altitude, iso).toBeLessThan(0)
    }
  })
})
