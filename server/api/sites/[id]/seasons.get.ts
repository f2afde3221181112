import { IdParamsSchema } from '../../../utils/validation'
import { computeSeasons } from '../../../core/light/seasons'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const q = readQueryAs(event, SiteSeasonsQuerySchema)
  const site = requireSite(id)
  return { siteId: site.id, ...computeSeasons({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, year: q.year, minCivilHours: q.minCivilHours }) }
})
