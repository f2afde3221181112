import { IdParamsSchema } from '../../../utils/validation'
import { computeLightDays } from '../../../core/light/index'
import { attachMoonToDays } from '../../../core/light/moon'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const q = readQueryAs(event, SiteLightQuerySchema)
  const site = requireSite(id)
  const days = attachMoonToDays(computeLightDays({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from: q.from, to: q.to }), site)
  return { siteId: site.id, latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, days }
})
