// Optional periodic forecast refresh for every active site. Off unless FORECAST_REFRESH_MINUTES is a
// positive number (tests leave it unset, so nothing fetches behind their back). When on, it refreshes
// once shortly after start (FORECAST_REFRESH_DELAY_MS, default 5 s) and then every N minutes; a failed
// fetch is stored with its reason and the last good forecast stays.
import { seedReady } from './1.seed'
import { useServerConfig } from '../utils/config'

const MIN_INTERVAL_MINUTES = 5

export default defineNitroPlugin((nitroApp) => {
  const config = useServerConfig()
  const minutes = config.forecastRefreshMinutes
  // one worker of a cluster fetches: the others would store the same forecasts again
  if (minutes === null || !config.timerWorker) return
  const settings = readForecastSettings()
  if (!settings.baseUrl) {
    console.warn('[gloamline] FORECAST_REFRESH_MINUTES is set but FORECAST_BASE_URL is not: no forecasts will be fetched')
    return
  }
  let running = false
  const refreshAll = async () => {
    if (running) return
    running = true
    try {
      // the demo seed runs asynchronously at start; its sites must exist before the first round
      await seedReady.promise
      const db = useDB()
      for (const site of listSites()) {
        const outcome = await refreshSiteForecast(db, site, { ...settings, actorId: null })
        if (outcome.refreshed) reassessSiteReviewReasons(db, site.id)
        if (!outcome.refreshed) console.warn(`[gloamline] forecast for site ${site.id} not refreshed: ${outcome.status} (${outcome.message})`)
      }
    } catch (error) {
      console.error('[gloamline] forecast refresh failed', error)
    } finally {
      running = false
    }
  }
  const intervalMs = Math.max(minutes, MIN_INTERVAL_MINUTES) * 60_000
  const first = setTimeout(refreshAll, config.forecastRefreshDelayMs)
  const timer = setInterval(refreshAll, intervalMs)
  first.unref()
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearTimeout(first)
    clearInterval(timer)
  })
  console.info(`[gloamline] forecasts refresh every ${Math.max(minutes, MIN_INTERVAL_MINUTES)} min from ${settings.baseUrl}`)
})
