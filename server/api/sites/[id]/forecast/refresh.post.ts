import { IdParamsSchema } from '../../../../utils/validation'

// Fetches a new forecast for the site now. A failed fetch is recorded with its reason and answered
// with 200 and refreshed: false: the request did what it was asked, and the last good forecast stays.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety', 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const site = requireSite(id)
  const db = useDB()
  const outcome = await refreshSiteForecast(db, site, { ...readForecastSettings(), actorId: actor.id })
  // new cold figures may add or drop a review reason (docs/api.md: cold)
  if (outcome.refreshed) reassessSiteReviewReasons(db, site.id)
  return { siteId: site.id, ...outcome, forecast: loadSiteForecast(db, site.id, nowMs()) }
})
