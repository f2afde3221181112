// Whole days away read in the person's own zone (their own, else their home site's, else UTC), and no
// evening-before reminder for work on a day away. A fresh database with invented people and sites.
// Zone offsets are from the tz database as Node's Intl reads it: New Zealand keeps daylight time
// (UTC+13) in January, Svalbard (Arctic/Longyearbyen) keeps UTC+1 in winter.
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import type { AppDatabase } from '../../server/utils/db'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { people, shiftAssignees, shifts, sites } from '../../server/db/schema'
import { createBlockedSpan, listBlockedSpans } from '../../server/services/availability'
import { planRemindersForDate } from '../../server/services/reminders'

let db: AppDatabase
let ids: { coord: number, own: number, home: number, plain: number, site: number }

beforeEach(() => {
  db = createTestDatabase('gloamline-away-')
  const [site] = db.insert(sites).values([{ name: 'Invented Ice Hut', latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' }]).returning().all()
  const [coord, own, home, plain] = db.insert(people).values([
    { name: 'Test Coordinator', email: 'coord@away.example.test', role: 'coordinator' },
    { name: 'Own Zone', email: 'own@away.example.test', role: 'crew', timezone: 'Pacific/Auckland', homeSiteId: site!.id },
    { name: 'Home Site', email: 'home@away.example.test', role: 'crew', homeSiteId: site!.id },
    { name: 'No Zone', email: 'plain@away.example.test', role: 'crew' }
  ]).returning().all()
  ids = { coord: coord!.id, own: own!.id, home: home!.id, plain: plain!.id, site: site!.id }
})
afterEach(() => {
  db.$client.close()
  removeTestDatabases()
})

describe('whole days away', () => {
  it('reads a day in the zone set on the person, before their home site\'s', () => {
    const span = createBlockedSpan(db, ids.coord, { personId: ids.own, start: '2027-01-10', end: '2027-01-10', reason: 'Leave' })
    expect([span.start, span.end]).toEqual(['2027-01-09T11:00:00.000Z', '2027-01-10T11:00:00.000Z'])
  })

  it('reads a day in the home site\'s zone when the person has none', () => {
    const span = createBlockedSpan(db, ids.coord, { personId: ids.home, start: '2027-01-10', end: '2027-01-11', reason: 'Travel' })
    expect([span.start, span.end]).toEqual(['2027-01-09T23:00:00.000Z', '2027-01-11T23:00:00.000Z'])
  })

  it('reads a day in UTC for a person with neither, and instants as given', () => {
    expect(createBlockedSpan(db, ids.coord, { personId: ids.plain, start: '2027-01-10', end: '2027-01-10', reason: '' }).start).toBe('2027-01-10T00:00:00.000Z')
    expect(createBlockedSpan(db, ids.coord, { personId: ids.plain, start: '2027-02-01T06:00:00+01:00', end: '2027-02-01T18:00:00+01:00', reason: '' }).start).toBe('2027-02-01T05:00:00.000Z')
  })

  it('lists one person\'s days by their own dates', () => {
    createBlockedSpan(db, ids.coord, { personId: ids.home, start: '2027-01-10', end: '2027-01-10', reason: 'Leave' })
    expect(listBlockedSpans(db, { personId: ids.home, from: '2027-01-10', to: '2027-01-10' })).toHaveLength(1)
    expect(listBlockedSpans(db, { personId: ids.home, from: '2027-01-11', to: '2027-01-11' })).toHaveLength(0)
  })
})

describe('reminders and days away', () => {
  it('sends no reminder for work on a day the person is away, and still reminds the others', () => {
    // 10 January 2027, 09:00–13:00 at the hut (UTC+1): 08:00–12:00 UTC
    const [shift] = db.insert(shifts).values([{ siteId: ids.site, title: 'Hut check', startAt: new Date('2027-01-10T08:00:00Z'), endAt: new Date('2027-01-10T12:00:00Z'), light: 'any' }]).returning().all()
    db.insert(shiftAssignees).values([{ shiftId: shift!.id, personId: ids.home }, { shiftId: shift!.id, personId: ids.plain }]).run()
    expect(planRemindersForDate(db, '2027-01-10').map(p => p.person.id)).toEqual([ids.home, ids.plain])
    createBlockedSpan(db, ids.coord, { personId: ids.home, start: '2027-01-10', end: '2027-01-10', reason: 'Leave' })
    expect(planRemindersForDate(db, '2027-01-10').map(p => p.person.id)).toEqual([ids.plain])
  })
})
