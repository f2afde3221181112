import { Body, Observer, SearchAltitude } from 'astronomy-engine'
import { afterEach, describe, expect, it } from 'vitest'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { crewMembers, crews, people, shiftAssignees, shifts, sites, unavailability } from '../../server/db/schema'
import { searchSlots, SlotSearchBodySchema } from '../../server/services/slot-search'
import { referenceMidnight } from '../support/outlook-reference'

// The slot search as the route runs it, on a fresh SQLite database with invented people and sites.
// Reference for civil dawn: astronomy-engine SearchAltitude, the sun's centre rising through −6°
// (USNO civil twilight, docs/light-model.md). Clock changes: EU summer time (Directive 2000/84/EC) as the tz
// data applies it to Europe/Oslo, 01:00 UTC on the last Sunday of March.
const RAVNVIK = { name: 'Test Yard 69N', latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }
const PAST = Date.parse('2020-01-01T00:00:00Z')
const QUARTER = 15 * 60_000

afterEach(() => removeTestDatabases())

function freshDatabase() {
  const db = createTestDatabase('gloamline-slots-')
  const site = db.insert(sites).values(RAVNVIK).returning().get()
  const [ada, bo, cy] = db.insert(people).values([
    { name: 'Ada Test', email: 'ada@slots.test', role: 'crew' },
    { name: 'Bo Test', email: 'bo@slots.test', role: 'crew' },
    { name: 'Cy Test', email: 'cy@slots.test', role: 'crew' }
  ]).returning().all()
  return { db, site, ada: ada!, bo: bo!, cy: cy! }
}

const body = (over: Record<string, unknown>) => SlotSearchBodySchema.parse({ durationMinutes: 60, light: 'civil', ...over })

describe('slot search on a database', () => {
  it('across the spring clock change: slots on the local quarter hour at civil dawn, with the new offset after the change', () => {
    const { db, site, ada } = freshDatabase()
    const result = searchSlots(db, body({ siteId: site.id, from: '2027-03-27', to: '2027-03-29', assigneeIds: [ada.id] }), PAST)
    expect(result.slots.map(s => s.date)).toEqual(['2027-03-27', '2027-03-28', '2027-03-29'])
    expect(result.slots.map(s => s.start.slice(19))).toEqual(['+01:00', '+02:00', '+02:00'])
    const observer = new Observer(RAVNVIK.latitude, RAVNVIK.longitude, 0)
    for (const slot of result.slots) {
      expect(slot.start).toMatch(/T\d{2}:(00|15|30|45):00\+0\d:00$/)
      const dawn = SearchAltitude(Body.Sun, observer, +1, new Date(referenceMidnight(slot.date, RAVNVIK.timezone)), 1, -6)!.date.getTime()
      // the earliest slot starts on the first quarter hour of the local clock at or after civil dawn
      const midnight = referenceMidnight(slot.date, RAVNVIK.timezone)
      const expected = midnight + Math.ceil((dawn - midnight) / QUARTER) * QUARTER
      expect(Date.parse(slot.start)).toBe(expected)
      expect(slot.assignees).toEqual([{ id: ada.id, name: 'Ada Test' }])
    }
  })

  it('by crew: honours a member\'s leave from the unavailability table and another shift\'s rest', () => {
    const { db, site, ada, bo, cy } = freshDatabase()
    const crew = db.insert(crews).values({ name: 'Test crew' }).returning().get()
    db.insert(crewMembers).values([ada, bo, cy].map(p => ({ crewId: crew.id, personId: p.id }))).run()
    // Bo is on leave the whole first day; Cy works until 23:00 local on the evening before the second
    const day1 = referenceMidnight('2027-01-20', RAVNVIK.timezone)
    db.insert(unavailability).values({ personId: bo.id, startAt: new Date(day1), endAt: new Date(day1 + 86_400_000), reason: 'Leave' }).run()
    const late = db.insert(shifts).values({ siteId: site.id, title: 'Late task', startAt: new Date(day1 + 17 * 3_600_000), endAt: new Date(day1 + 23 * 3_600_000), light: 'any' }).returning().get()
    db.insert(shiftAssignees).values({ shiftId: late.id, personId: cy.id }).run()
    const result = searchSlots(db, body({ siteId: site.id, from: '2027-01-20', to: '2027-01-21', crewId: crew.id, durationMinutes: 120 }), PAST)
    // the whole crew: nothing on the 20th (Bo away; Cy's late shift too close), and on the 21st not before 10:00 (Cy's 11 h of rest)
    expect(result.slots.map(s => s.date)).toEqual(['2027-01-21'])
    expect(Date.parse(result.slots[0]!.start)).toBeGreaterThanOrEqual(day1 + (24 + 10) * 3_600_000)
    // any two of the three: the 20th has a slot again, without Bo
    const two = searchSlots(db, body({ siteId: site.id, from: '2027-01-20', to: '2027-01-21', crewId: crew.id, durationMinutes: 120, headcount: 2 }), PAST)
    const first = two.slots.find(s => s.date === '2027-01-20')!
    expect(first.assigneeIds).toHaveLength(2)
    expect(first.assigneeIds).not.toContain(bo.id)
  })

  it('refuses bad input with the field named', () => {
    const issues = (input: Record<string, unknown>) => SlotSearchBodySchema.safeParse(input).error?.issues.map(i => i.path.join('.')) ?? []
    const ok = { siteId: 1, durationMinutes: 60, light: 'civil', from: '2027-01-20', to: '2027-01-21', assigneeIds: [1] }
    expect(SlotSearchBodySchema.safeParse(ok).success).toBe(true)
    expect(issues({ ...ok, assigneeIds: [] })).toEqual(['assigneeIds'])
    expect(issues({ ...ok, to: '2027-04-21' })).toEqual(['to'])
    expect(issues({ ...ok, to: '2027-01-19' })).toEqual(['to'])
    expect(issues({ ...ok, durationMinutes: 5 })).toEqual(['durationMinutes'])
    expect(issues({ ...ok, light: 'moonlight' })).toEqual(['light'])
    expect(issues({ ...ok, rank: 'random' })).toEqual(['rank'])
    expect(issues({ ...ok, from: '2027-02-30' })).toEqual(['from'])
  })
})
