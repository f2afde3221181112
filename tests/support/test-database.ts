import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { applyMigrations, openDatabase } from '../../server/utils/db'

const MIGRATIONS = resolve(import.meta.dirname, '../../drizzle')
const dirs: string[] = []

/** A fresh SQLite file with every migration applied, in a temporary folder. */
export function createTestDatabase(prefix = 'gloamline-test-') {
  const dir = mkdtempSync(join(tmpdir(), prefix))
  dirs.push(dir)
  const db = openDatabase(join(dir, 'test.sqlite'))
  applyMigrations(db, MIGRATIONS)
  return db
}

/** Removes the folders of every test database made so far (call it in afterEach). */
export function removeTestDatabases() {
  for (const dir of dirs.splice(0)) rmSync(dir, { recursive: true, force: true })
}
