import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { sql } from 'drizzle-orm'
import { afterAll, describe, expect, it } from 'vitest'
import { applyMigrations, openDatabase } from '../../server/utils/db'
import { seedDemoScenario } from '../../server/db/seed'
import { backupDatabase } from '../../scripts/backup.mjs'

const dir = mkdtempSync(join(tmpdir(), 'gloamline-backup-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

const TABLES = ['people', 'sites', 'crews', 'crew_members', 'shifts', 'shift_assignees', 'unavailability']

describe('backup and restore', () => {
  it('copies a live database consistently while it is being written, and the copy opens with every row', async () => {
    const db = openDatabase(join(dir, 'live.sqlite'))
    applyMigrations(db, resolve(import.meta.dirname, '../../drizzle'))
    seedDemoScenario(db, 'hash', Date.parse('2026-12-01T12:00:00Z'))
    const count = (d: typeof db, table: string) => d.get<{ n: number }>(sql.raw(`select count(*) as n from ${table}`))!.n
    const before = Object.fromEntries(TABLES.map(t => [t, count(db, t)]))

    const copy = await backupDatabase(join(dir, 'live.sqlite'), join(dir, 'copy.sqlite'))
    // the live database keeps changing after the copy was taken
    db.run(sql`insert into crews (name) values ('Added after the backup')`)

    const restored = openDatabase(copy.destination)
    expect(restored.$client.pragma('integrity_check', { simple: true })).toBe('ok')
    expect(Object.fromEntries(TABLES.map(t => [t, count(restored, t)]))).toEqual(before)
    expect(copy.pages).toBeGreaterThan(0)
  })
})
