import { IdParamsSchema } from '../../../utils/validation'

// One safety decision for every waiting shift of a rotation (safety only); with `seen`, only the
// shifts at the versions the reviewer saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, ReviewBodySchema)
  const { seen } = await readBodyAs(event, RotationReviewSeenSchema)
  return reviewRotation(useDB(), actor, id, body, seen)
})
