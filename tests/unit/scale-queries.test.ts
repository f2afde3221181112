import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { people, sites } from '../../server/db/schema'
import type { AppDatabase } from '../../server/utils/db'
import { findShiftsInRange, loadAssignees, loadLatestReviews } from '../../server/services/shifts'
import { buildCrewToday, loadPersonShifts } from '../../server/services/crew-day'
import { buildPersonFeed } from '../../server/services/feed'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

// SQLite binds at most 32,766 parameters in one statement (SQLITE_MAX_VARIABLE_NUMBER, the default
// since SQLite 3.32.0, sqlite.org/limits.html §9). A read that passes one parameter per shift
// fails beyond that; these reads must keep working for a person with more shifts than that.
const SQLITE_MAX_VARIABLES = 32_766
const HOUR = 3_600_000
const OLD_SHIFTS = SQLITE_MAX_VARIABLES + 234
// an invented yard and crew member; every shift is one hour, every two hours from 2020
const FIRST_MS = Date.parse('2020-01-01T06:00:00Z')
const NOW_MS = Date.parse('2030-01-15T10:00:00Z')
const RECENT = ['2030-01-15T12:00:00Z', '2030-01-16T09:00:00Z', '2030-01-17T09:00:00Z'].map(Date.parse)

let db: AppDatabase
let personId: number
let otherId: number

beforeAll(() => {
  db = createTestDatabase('gloamline-scale-')
  const site = db.insert(sites).values({ name: 'Test Yard 70N', latitude: 70.0, longitude: 23.0, timezone: 'Europe/Oslo' }).returning().get()
  const [person, other] = db.insert(people).values([
    { name: 'Many Shifts', email: 'many@scale.test', role: 'crew' },
    { name: 'Some Shifts', email: 'some@scale.test', role: 'crew' }
  ]).returning().all()
  personId = person!.id
  otherId = other!.id
  const sqlite = db.$client
  const shift = sqlite.prepare('insert into shifts (site_id, title, start_at, end_at, light, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?)')
  const assign = sqlite.prepare('insert into shift_assignees (shift_id, person_id) values (?, ?)')
  sqlite.transaction(() => {
    const starts = [...Array.from({ length: OLD_SHIFTS }, (_, i) => FIRST_MS + i * 2 * HOUR), ...RECENT]
    starts.forEach((startMs, i) => {
      const id = Number(shift.run(site.id, `Scale shift ${i + 1}`, startMs, startMs + HOUR, 'any', startMs, startMs).lastInsertRowid)
      assign.run(id, personId)
      if (i % 1000 === 0) assign.run(id, otherId)
    })
  })()
})

afterAll(() => removeTestDatabases())

describe(`reads past SQLite's ${SQLITE_MAX_VARIABLES}-parameter limit`, () => {
  it('the fixture really holds more shifts for one person than one statement may bind', () => {
    const count = db.$client.prepare('select count(*) from shift_assignees where person_id = ?').pluck().get(personId) as number
    expect(count).toBe(OLD_SHIFTS + RECENT.length)
    expect(count).toBeGreaterThan(SQLITE_MAX_VARIABLES)
  })

  it('the shift list of every shift of that person (no range) answers all of them, with their people', () => {
    const list = findShiftsInRange(db, { personId })
    expect(list).toHaveLength(OLD_SHIFTS + RECENT.length)
    expect(list.every(s => s.assigneeIds.includes(personId))).toBe(true)
    expect(list.filter(s => s.assigneeIds.includes(otherId))).toHaveLength(Math.ceil((OLD_SHIFTS + RECENT.length) / 1000))
    expect(list.slice(-3).map(s => Date.parse(s.start))).toEqual(RECENT)
  })

  it('the shift list of one week for that person answers that week only', () => {
    const week = findShiftsInRange(db, { personId, from: '2030-01-14', to: '2030-01-21' })
    expect(week.map(s => Date.parse(s.start))).toEqual(RECENT)
  })

  it('a shift overlapping the start of the range is listed, one ending at it is not', () => {
    // the shift 2 h after the first ends at 09:00 UTC; the range starts at 08:30 UTC
    const list = findShiftsInRange(db, { personId, from: '2020-01-01T08:30:00Z', to: '2020-01-01T09:00:00Z' })
    expect(list.map(s => s.title)).toEqual(['Scale shift 2'])
  })

  it('loading assignees and reviews for a listed set of ids larger than the limit still works', () => {
    const ids = db.$client.prepare('select shift_id from shift_assignees where person_id = ?').pluck().all(personId) as number[]
    expect(ids.length).toBeGreaterThan(SQLITE_MAX_VARIABLES)
    const assignees = loadAssignees(db, ids)
    expect(assignees.size).toBe(ids.length)
    expect(loadLatestReviews(db, ids.map(id => ({ id, reviewState: 'not-needed' as const }))).size).toBe(0)
  })

  it('the person\'s own shifts in a window, the crew home and the calendar feed answer', () => {
    expect(loadPersonShifts(db, personId, NOW_MS - 24 * HOUR, NOW_MS + 7 * 24 * HOUR).map(s => s.startAt.getTime())).toEqual(RECENT)
    const today = buildCrewToday(db, personId, NOW_MS)
    expect(today.basis).toBe('shifts')
    expect(today.sites[0]!.days.flatMap(d => d.shifts).map(s => Date.parse(s.start))).toEqual(RECENT.slice(0, 2))
    const person = db.query.people.findFirst({ where: (p, { eq }) => eq(p.id, personId) }).sync()!
    const feed = buildPersonFeed(db, person, { nowMs: NOW_MS })
    // RFC 5545: one VEVENT per shift inside the feed's window (60 days back), none of the old ones
    expect(feed.match(/BEGIN:VEVENT/g)).toHaveLength(RECENT.length)
  })
})
