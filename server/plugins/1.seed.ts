import { DEMO_PASSWORD, isDatabaseEmpty, seedDemoScenario } from '../db/seed'
import { useServerConfig } from '../utils/config'

// The demo start (npm start) and the tests set SEED_DEMO=1; a real deployment leaves it unset.
// Nitro does not await plugins, so requests wait on this promise (server/middleware/0.ready.ts).
export const seedReady: { promise: Promise<void> } = { promise: Promise.resolve() }

export default defineNitroPlugin(() => {
  if (!useServerConfig().seedDemo) return
  const db = useDB()
  if (!isDatabaseEmpty(db)) return
  seedReady.promise = (async () => {
    const started = performance.now()
    seedDemoScenario(db, await hashPassword(DEMO_PASSWORD))
    console.info(`[gloamline] demo scenario seeded in ${Math.round(performance.now() - started)} ms`)
  })()
})
