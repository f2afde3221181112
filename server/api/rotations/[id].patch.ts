import { IdParamsSchema } from '../../utils/validation'

// Changes a rotation's shifts on and after fromDate; earlier ones stay as they were (coordinator).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, RotationPatchSchema)
  const { changed } = updateRotationFrom(useDB(), actor, id, body)
  return { ...loadRotationReply(useDB(), id), changed }
})
