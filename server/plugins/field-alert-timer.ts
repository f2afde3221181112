import { seedReady } from './1.seed'
import { useServerConfig } from '../utils/config'

// The field alert check: every FIELD_ALERT_INTERVAL_MS (30 s by default, never more than a minute),
// whether or not anyone is signed in, queue the current alert step of every overdue party or missed
// lone-worker check-in, then send what the outbox has due. Safe in every worker of a cluster and
// across restarts: each step's message has a unique outbox key (outing, alert, step, person), so a
// second process or a restarted one finds it and queues nothing; sending claims a message under a
// lease first, so only one process sends it. FIELD_ALERT_TIMER=off disables it.
export default defineNitroPlugin((nitroApp) => {
  const config = useServerConfig()
  if (!config.fieldAlertTimer) return
  let running = false

  async function tick() {
    if (running) return
    running = true
    try {
      await seedReady.promise
      const db = useDB()
      const queued = queueFieldAlerts(db, nowMs(), resolvePublicBaseUrl())
      if (queued) console.info(`[gloamline] field alerts queued: ${queued}`)
      await deliverDueOutboxMessages(db, nowMs())
    } catch (err) {
      console.error('[gloamline] field alert check failed', err)
    } finally {
      running = false
    }
  }

  const first = setTimeout(tick, Math.min(config.fieldAlertIntervalMs, 2_000))
  const timer = setInterval(tick, config.fieldAlertIntervalMs)
  first.unref()
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearTimeout(first)
    clearInterval(timer)
  })
})
