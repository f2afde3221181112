import { sites } from '../../db/schema'
import { SiteBodySchema } from '../../../shared/schemas/site'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, SiteBodySchema)
  const site = useDB().transaction((tx) => {
    const row = tx.insert(sites).values(body).returning().get()
    recordAudit(tx, actor.id, 'site.create', 'site', row.id, { name: row.name })
    return row
  })
  setResponseStatus(event, 201)
  return site
})
