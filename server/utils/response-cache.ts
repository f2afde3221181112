import type { AppDatabase } from './db'

/**
 * A small least-recently-used cache of serialised JSON replies. Light for a place and dates is a
 * pure function, so it caches by its inputs alone; database reads add a data stamp to the key.
 */
export function createReplyCache(maxEntries = 300) {
  const entries = new Map<string, string>()
  return {
    get(key: string) {
      const hit = entries.get(key)
      if (hit !== undefined) {
        entries.delete(key)
        entries.set(key, hit)
      }
      return hit
    },
    set(key: string, json: string) {
      entries.set(key, json)
      if (entries.size > maxEntries) entries.delete(entries.keys().next().value!)
      return json
    },
    clear: () => entries.clear()
  }
}

const stampStatements = new WeakMap<object, { changes: { get: () => unknown } }>()

/**
 * Changes whenever the database does: total_changes() counts every row this process wrote, and
 * data_version moves when another connection commits (a restore, a maintenance script).
 */
export function readDataStamp(db: AppDatabase): string {
  let statements = stampStatements.get(db.$client)
  if (!statements) {
    statements = { changes: db.$client.prepare('select total_changes() as n').pluck() }
    stampStatements.set(db.$client, statements)
  }
  return `${statements.changes.get()}:${db.$client.pragma('data_version', { simple: true })}`
}
