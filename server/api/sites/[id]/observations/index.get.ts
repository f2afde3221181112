import { z } from 'zod'
import { InstantSchema, IdParamsSchema } from '../../../../utils/validation'

const DAY_MS = 86_400_000
const QuerySchema = z.object({
  from: InstantSchema.optional(),
  to: InstantSchema.optional()
}).refine(q => !q.from || !q.to || Date.parse(q.from) <= Date.parse(q.to), { path: ['to'], message: 'must not be before from' })

// Site readings in a range of instants (default: the last 7 days), oldest first.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = readParamsAs(event, IdParamsSchema)
  const query = readQueryAs(event, QuerySchema)
  const site = requireSite(id)
  const toMs = query.to ? Date.parse(query.to) : nowMs()
  const fromMs = query.from ? Date.parse(query.from) : toMs - 7 * DAY_MS
  return { siteId: site.id, timezone: site.timezone, observations: loadSiteObservations(useDB(), site.id, fromMs, toMs) }
})
