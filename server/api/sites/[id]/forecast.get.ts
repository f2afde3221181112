import { IdParamsSchema } from '../../../utils/validation'

// The stored forecast of a site: the newest good one (marked fresh or stale), and the newest attempt,
// which may have failed. Nothing is fetched here.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const site = requireSite(id)
  const stored = loadSiteForecast(useDB(), site.id, nowMs())
  return { siteId: site.id, timezone: site.timezone, staleAfterHours: SITE_FORECAST_STALE_HOURS, ...stored }
})
