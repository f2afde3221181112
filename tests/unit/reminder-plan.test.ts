// Who gets a reminder for a date, when it is due, and that queuing twice creates nothing new; on a
// fresh database seeded with the demo scenario (invented data, used here only as a fixture). The
// expected recipients are worked out with a plain SQL query, independently of the planner.
import { eq, sql } from 'drizzle-orm'
import { afterEach, describe, expect, it } from 'vitest'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { seedDemoScenario } from '../../server/db/seed'
import { messages, people, shiftAssignees, shifts, sites } from '../../server/db/schema'
import { composeReminderKey, findDueReminderTargets, planRemindersForDate, queueRemindersForDate } from '../../server/services/reminders'
import { localMidnightMs } from '../../server/core/time/zoned'
import { addDays } from '../../shared/format'

const NOW = Date.parse('2027-01-12T12:00:00Z')
const DATE = '2027-01-13'

function seededDatabase() {
  const db = createTestDatabase('gloamline-reminders-')
  seedDemoScenario(db, 'not-a-real-hash', NOW)
  return db
}

afterEach(() => {
  removeTestDatabases()
})

// People with a shift starting on the local date at its site, by SQL over the tables (each site's
// local midnights computed with the tz data through date-fns-tz).
function expectedRecipients(db: ReturnType<typeof seededDatabase>, date: string): number[] {
  const ids = new Set<number>()
  for (const site of db.select().from(sites).all()) {
    const from = localMidnightMs(date, site.timezone)
    const to = localMidnightMs(addDays(date, 1), site.timezone)
    const rows = db.all<{ id: number }>(sql`select distinct p.id as id from shifts s join shift_assignees a on a.shift_id = s.id join people p on p.id = a.person_id
      where s.site_id = ${site.id} and s.cancelled_at is null and s.start_at >= ${from} and s.start_at < ${to} and p.active = 1 and p.reminders_enabled = 1`)
    rows.forEach(r => ids.add(r.id))
  }
  return [...ids].sort((a, b) => a - b)
}

describe('planning reminders', () => {
  it('plans one reminder per assigned, active person with reminders on, holding all their shifts that day', () => {
    const db = seededDatabase()
    const plans = planRemindersForDate(db, DATE)
    expect(plans.length).toBeGreaterThan(3)
    expect(plans.map(p => p.person.id)).toEqual(expectedRecipients(db, DATE))
    for (const plan of plans) {
      expect(plan.dedupeKey).toBe(composeReminderKey(plan.person.id, DATE, plan.shifts.map(s => s.id)))
      for (const s of plan.shifts) {
        const site = db.select().from(sites).where(eq(sites.id, s.siteId)).get()!
        expect(s.startAt.getTime()).toBeGreaterThanOrEqual(localMidnightMs(DATE, site.timezone))
        expect(s.startAt.getTime()).toBeLessThan(localMidnightMs(addDays(DATE, 1), site.timezone))
      }
    }
  })

  it('leaves out people who turned reminders off, inactive people and cancelled shifts', () => {
    const db = seededDatabase()
    const [first, second] = planRemindersForDate(db, DATE)
    db.update(people).set({ remindersEnabled: false }).where(eq(people.id, first!.person.id)).run()
    db.update(people).set({ active: false }).where(eq(people.id, second!.person.id)).run()
    const cancelled = planRemindersForDate(db, DATE)[0]!.shifts[0]!
    db.update(shifts).set({ cancelledAt: new Date(NOW) }).where(eq(shifts.id, cancelled.id)).run()
    const plans = planRemindersForDate(db, DATE)
    expect(plans.map(p => p.person.id)).not.toContain(first!.person.id)
    expect(plans.map(p => p.person.id)).not.toContain(second!.person.id)
    expect(plans.flatMap(p => p.shifts.map(s => s.id))).not.toContain(cancelled.id)
    expect(plans.map(p => p.person.id)).toEqual(expectedRecipients(db, DATE))
  })

  it('queues each reminder once: a second run for the date creates nothing', () => {
    const db = seededDatabase()
    const created = queueRemindersForDate(db, DATE, { baseUrl: null, nowMs: NOW })
    expect(created).toHaveLength(expectedRecipients(db, DATE).length)
    expect(queueRemindersForDate(db, DATE, { baseUrl: null, nowMs: NOW })).toEqual([])
    expect(db.select({ n: sql<number>`count(*)` }).from(messages).get()!.n).toBe(created.length)
  })

  it('queues an updated reminder when a person\'s shift set for the day changes', () => {
    const db = seededDatabase()
    queueRemindersForDate(db, DATE, { baseUrl: null, nowMs: NOW })
    const plan = planRemindersForDate(db, DATE)[0]!
    // a second shift for this person later the same day
    const first = plan.shifts[0]!
    const added = db.insert(shifts).values({ siteId: first.siteId, title: 'Extra sample run', light: 'any', startAt: new Date(first.startAt.getTime() + 3_600_000), endAt: new Date(first.startAt.getTime() + 2 * 3_600_000) }).returning().get()
    db.insert(shiftAssignees).values({ shiftId: added.id, personId: plan.person.id }).run()
    const created = queueRemindersForDate(db, DATE, { baseUrl: null, nowMs: NOW })
    const mine = db.select().from(messages).where(eq(messages.personId, plan.person.id)).all()
    expect(mine).toHaveLength(2)
    expect(created).toContain(mine[1]!.id)
    expect(mine[1]!.subject).toMatch(/^Updated: /)
    expect(mine[1]!.text).toContain('Extra sample run')
    expect(created).toHaveLength(1)
  })
})

describe('when reminders are due', () => {
  it('is due from the site\'s reminderHour in its own zone, for the next local day', () => {
    const db = seededDatabase()
    const addSite = (name: string, timezone: string, reminderHour?: number) => db.insert(sites).values({ name, latitude: 65, longitude: 10, timezone, reminderHour }).returning().get()
    const oslo = addSite('Test fjord site', 'Europe/Oslo')
    // 18:00 in Europe/Oslo on 12 Jan 2027 is 17:00 UTC (UTC+1 in winter, tz data)
    const before = findDueReminderTargets(db, Date.parse('2027-01-12T16:59:00Z'))
    const at = findDueReminderTargets(db, Date.parse('2027-01-12T17:00:00Z'))
    expect(oslo.reminderHour).toBe(18)
    expect(before.find(t => t.siteId === oslo.id)).toBeUndefined()
    expect(at.find(t => t.siteId === oslo.id)).toEqual({ siteId: oslo.id, date: '2027-01-13' })
    // at that instant it is 07:00 in Whitehorse (UTC−7): not due there yet
    const whitehorse = addSite('Test Yukon site', 'America/Whitehorse')
    expect(at.find(t => t.siteId === whitehorse.id)).toBeUndefined()
  })

  it('follows a changed reminderHour and the site\'s own date across midnight UTC', () => {
    const db = seededDatabase()
    const mcmurdo = db.insert(sites).values({ name: 'Test ice shelf site', latitude: -77.8, longitude: 166.7, timezone: 'Antarctica/McMurdo' }).returning().get()
    db.update(sites).set({ reminderHour: 6 }).where(eq(sites.id, mcmurdo.id)).run()
    // 2027-01-12T18:00Z is 07:00 on 13 Jan in Antarctica/McMurdo (NZDT, UTC+13): due for 14 Jan
    expect(findDueReminderTargets(db, Date.parse('2027-01-12T18:00:00Z')).find(t => t.siteId === mcmurdo.id)).toEqual({ siteId: mcmurdo.id, date: '2027-01-14' })
  })
})
