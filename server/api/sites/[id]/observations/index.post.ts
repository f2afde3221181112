import { IdParamsSchema } from '../../../../utils/validation'

// One reading entered by hand: air temperature and wind at 10 m, in metric or imperial units.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety', 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, ObservationInputSchema)
  const site = requireSite(id)
  const checked = convertObservationInput(body, site.timezone, nowMs())
  if (!checked.ok) throw invalidInput([{ field: checked.field, message: checked.message }])
  const [stored] = insertSiteObservations(useDB(), actor.id, site.id, [checked.row], 'manual')
  reassessSiteReviewReasons(useDB(), site.id)
  setResponseStatus(event, 201)
  return stored
})
