import { existsSync, mkdirSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import Database from 'better-sqlite3'
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3'
import { migrate } from 'drizzle-orm/better-sqlite3/migrator'
import * as schema from '../db/schema'
import { useServerConfig } from './config'

export type AppDatabase = BetterSQLite3Database<typeof schema> & { $client: Database.Database }

let current: AppDatabase | undefined

/** Opens a SQLite file with WAL and foreign keys on, wrapped in Drizzle with the app's schema. */
export function openDatabase(path: string, options: { readonly?: boolean } = {}): AppDatabase {
  if (path !== ':memory:' && !options.readonly) mkdirSync(dirname(resolve(path)), { recursive: true })
  const sqlite = new Database(path, { readonly: options.readonly === true })
  if (!options.readonly) sqlite.pragma('journal_mode = WAL')
  sqlite.pragma('foreign_keys = ON')
  sqlite.pragma('busy_timeout = 5000')
  const db = drizzle(sqlite, { schema }) as AppDatabase
  if (!options.readonly) {
    // Transactions take the write lock as they begin (BEGIN IMMEDIATE). With several processes on one
    // file (npm start's workers), a deferred transaction that read first could find its snapshot stale
    // at its first write (SQLITE_BUSY_SNAPSHOT), which busy_timeout does not wait out; taking the lock
    // at the start turns that into an ordinary wait.
    const transaction = db.transaction.bind(db)
    db.transaction = ((fn, config) => transaction(fn, { behavior: 'immediate', ...config })) as AppDatabase['transaction']
  }
  return db
}

/** Finds the migrations folder: env override, next to the built server, then the source tree. */
export function findMigrationsDir(): string {
  const candidates = [
    useServerConfig().migrationsDir,
    process.argv[1] ? join(dirname(process.argv[1]), 'drizzle') : undefined,
    resolve('.output/server/drizzle'),
    resolve('drizzle')
  ].filter((dir): dir is string => Boolean(dir))
  const found = candidates.find(dir => existsSync(join(dir, 'meta', '_journal.json')))
  if (!found) throw new Error(`No migrations folder found (looked in ${candidates.join(', ')})`)
  return found
}

/** Applies every pending drizzle-kit migration. */
export function applyMigrations(db: AppDatabase, dir = findMigrationsDir()) {
  migrate(db, { migrationsFolder: dir })
}

/** True when DATABASE_READ_ONLY=1: a maintenance mode that serves reads and answers writes with 503. */
export function isDatabaseReadOnly() {
  return useServerConfig().databaseReadOnly
}

/** The process-wide database handle, opened on first use from DATABASE_PATH. */
export function useDB(): AppDatabase {
  if (!current) current = openDatabase(useServerConfig().databasePath, { readonly: isDatabaseReadOnly() })
  return current
}

export { schema as tables }
