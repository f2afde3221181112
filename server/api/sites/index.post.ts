import { SiteBodySchema } from '../../../shared/schemas/site'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, SiteBodySchema)
  const site = createSite(useDB(), actor.id, body)
  setResponseStatus(event, 201)
  return site
})
