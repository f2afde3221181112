import { seedReady } from './1.seed'
import { closeMailTransports } from '../adapters/mail'
import { useServerConfig } from '../utils/config'

// Scheduled sending: once a minute, queue the reminders that are due (each site's reminderHour in its
// own zone has come, for the next local day) and send whatever the outbox has due, including failed
// sends whose back-off has passed. REMINDER_TIMER=off disables it (tests that do not test it);
// REMINDER_TIMER_INTERVAL_MS shortens the minute for the tests that do.
export default defineNitroPlugin((nitroApp) => {
  const config = useServerConfig()
  // one worker of a cluster runs it (the outbox's keys and sending lease would make more safe, but idle)
  if (!config.reminderTimer || !config.timerWorker) return
  const intervalMs = config.reminderIntervalMs
  let running = false

  async function tick() {
    // a tick that takes longer than the interval (a slow SMTP server) is not overlapped by the next
    if (running) return
    running = true
    try {
      await seedReady.promise
      const db = useDB()
      queueDueReminders(db, nowMs(), resolvePublicBaseUrl())
      // work waiting for review that no digest listed yet (imports, weather): one digest per officer per run
      queueReviewDigests(db, { baseUrl: resolvePublicBaseUrl(), nowMs: nowMs() })
      await deliverDueOutboxMessages(db, nowMs())
    } catch (err) {
      console.error('[gloamline] reminder timer tick failed', err)
    } finally {
      running = false
    }
  }

  const first = setTimeout(tick, Math.min(intervalMs, 5_000))
  const timer = setInterval(tick, intervalMs)
  first.unref()
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearTimeout(first)
    clearInterval(timer)
    closeMailTransports()
  })
})
