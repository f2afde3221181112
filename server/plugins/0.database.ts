// Applies the drizzle-kit migrations at start-up, in every environment, before any request.
export default defineNitroPlugin(() => {
  const started = Date.now()
  applyMigrations(useDB())
  console.info(`[gloamline] database ready (${process.env.DATABASE_PATH || '.data/gloamline.sqlite'}, migrations in ${Date.now() - started} ms)`)
})
