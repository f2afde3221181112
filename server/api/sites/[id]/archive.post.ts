import { IdParamsSchema } from '../../../utils/validation'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const { archived } = await readBodyAs(event, SiteArchiveSchema)
  return archiveSite(useDB(), actor.id, id, archived)
})
