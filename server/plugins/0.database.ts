// Applies the drizzle-kit migrations at start-up, in every environment, before any request.
import { useServerConfig } from '../utils/config'

export default defineNitroPlugin(() => {
  if (isDatabaseReadOnly()) {
    console.warn('[gloamline] database opened read-only (DATABASE_READ_ONLY=1): reads are served, every write answers 503')
    return
  }
  const started = performance.now()
  applyMigrations(useDB())
  console.info(`[gloamline] database ready (${useServerConfig().databasePath}, migrations in ${Math.round(performance.now() - started)} ms)`)
})
