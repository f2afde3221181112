import { sql } from 'drizzle-orm'

// Liveness and readiness for whoever runs the server: the database answers and migrations are applied.
export default defineEventHandler((event) => {
  try {
    const row = useDB().get<{ n: number }>(sql`select count(*) as n from __drizzle_migrations`)
    return { status: 'ok', migrations: row?.n ?? 0 }
  } catch (err) {
    setResponseStatus(event, 503)
    return { status: 'unavailable', message: err instanceof Error ? err.message : 'database not reachable' }
  }
})
