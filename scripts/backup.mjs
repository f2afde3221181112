// `npm run backup [destination]`: a consistent online copy of the SQLite database through
// better-sqlite3's backup API (safe while the server runs and writes).
import { mkdirSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import Database from 'better-sqlite3'

/** Copies the database at `source` to `destination`; resolves to { destination, pages, ms }. */
export async function backupDatabase(source, destination) {
  mkdirSync(dirname(resolve(destination)), { recursive: true })
  const started = Date.now()
  const db = new Database(source, { fileMustExist: true })
  try {
    const result = await db.backup(destination)
    return { destination, pages: result.totalPages, ms: Date.now() - started }
  } finally {
    db.close()
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const source = process.env.DATABASE_PATH || '.data/gloamline.sqlite'
  const stamp = new Date().toISOString().replace(/[:.]/g, '-')
  const destination = process.argv[2] || join('.data', 'backups', `gloamline-${stamp}.sqlite`)
  const { pages, ms } = await backupDatabase(source, destination)
  console.info(`[gloamline] backed up ${source} to ${destination}: ${pages} pages in ${ms} ms`)
}
