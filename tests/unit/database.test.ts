import { resolve } from 'node:path'
import { sql } from 'drizzle-orm'
import { afterEach, describe, expect, it } from 'vitest'
import { applyMigrations } from '../../server/utils/db'
import { isDatabaseEmpty, seedDemoScenario } from '../../server/db/seed'
import { people, shifts, sites } from '../../server/db/schema'
import { createTestDatabase as freshDatabase, removeTestDatabases } from '../support/test-database'

const MIGRATIONS = resolve(import.meta.dirname, '../../drizzle')

afterEach(removeTestDatabases)

describe('database', () => {
  it('applies the migrations to an empty file, with WAL and foreign keys on', () => {
    const db = freshDatabase()
    expect(db.$client.pragma('journal_mode', { simple: true })).toBe('wal')
    expect(db.$client.pragma('foreign_keys', { simple: true })).toBe(1)
    const tables = db.all<{ name: string }>(sql`select name from sqlite_master where type = 'table'`).map(t => t.name)
    expect(tables).toEqual(expect.arrayContaining(['people', 'sites', 'crews', 'crew_members', 'shifts', 'shift_assignees', 'audit_log']))
    // applying again is a no-op
    applyMigrations(db, MIGRATIONS)
  })

  it('seeds the demo once and never on a database that holds data', () => {
    const db = freshDatabase()
    expect(isDatabaseEmpty(db)).toBe(true)
    expect(seedDemoScenario(db, 'not-a-real-hash', Date.parse('2026-12-01T12:00:00Z'))).toBe(true)
    const counts = () => ({
      people: db.select({ n: sql<number>`count(*)` }).from(people).get()!.n,
      sites: db.select({ n: sql<number>`count(*)` }).from(sites).get()!.n,
      shifts: db.select({ n: sql<number>`count(*)` }).from(shifts).get()!.n
    })
    const first = counts()
    expect(first.people).toBeGreaterThanOrEqual(12)
    expect(first.sites).toBeGreaterThanOrEqual(4)
    expect(first.shifts).toBeGreaterThan(50)
    expect(seedDemoScenario(db, 'not-a-real-hash')).toBe(false)
    expect(counts()).toEqual(first)
  })

  it('refuses a shift at a site that does not exist (foreign key)', () => {
    const db = freshDatabase()
    expect(() => db.insert(shifts).values({ siteId: 999, title: 'x', startAt: new Date(), endAt: new Date(), light: 'any' }).run()).toThrow(/FOREIGN KEY/)
  })
})

describe('demo scenario', () => {
  it('has all three roles, a site in the far south, sites from about 60° to 80° north, and some flagged work', () => {
    const db = freshDatabase()
    seedDemoScenario(db, 'hash', Date.parse('2026-12-01T12:00:00Z'))
    const roles = new Set(db.select({ role: people.role }).from(people).all().map(p => p.role))
    expect([...roles].sort()).toEqual(['coordinator', 'crew', 'safety'])
    const lats = db.select({ lat: sites.latitude }).from(sites).all().map(s => s.lat)
    expect(Math.min(...lats)).toBeLessThan(-60)
    expect(Math.max(...lats)).toBeGreaterThan(75)
    expect(lats.some(l => l > 59 && l < 62)).toBe(true)
    const flagged = db.select({ n: sql<number>`count(*)` }).from(shifts).where(sql`flagged = 1`).get()!.n
    expect(flagged).toBeGreaterThan(0)
    const emails = db.select({ email: people.email }).from(people).all().map(p => p.email)
    expect(emails.every(e => e.endsWith('.test'))).toBe(true)
  })
})
