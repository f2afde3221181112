import { IdParamsSchema } from '../../utils/validation'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const patch = await readBodyAs(event, CrewPatchSchema)
  return updateCrew(useDB(), actor.id, id, patch)
})
