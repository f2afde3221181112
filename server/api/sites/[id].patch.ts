import { IdParamsSchema } from '../../utils/validation'

// New coordinates or a new zone re-check every live shift at the site (site-writes.ts).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const patch = await readBodyAs(event, SitePatchSchema)
  return updateSite(useDB(), actor.id, id, patch)
})
