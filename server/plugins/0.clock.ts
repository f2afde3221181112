// Moves the server's clock when the tests ask for it (GLOAMLINE_TEST_MODE=1 with GLOAMLINE_CLOCK_START,
// see utils/config.ts); otherwise the real clock stays.
import { runningClockFrom, setClock } from '../core/time/clock'
import { useServerConfig } from '../utils/config'

export default defineNitroPlugin(() => {
  const start = useServerConfig().testClockStart
  if (start === null) return
  if (!Number.isFinite(start)) throw new Error('GLOAMLINE_CLOCK_START is not an ISO instant')
  setClock(runningClockFrom(start))
  console.info(`[gloamline] test clock starts at ${new Date(start).toISOString()}`)
})
