import { IdParamsSchema } from '../../../utils/validation'

// One safety decision for every waiting shift of a rotation (safety only).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, ReviewBodySchema)
  const { decided, shiftIds } = reviewRotation(useDB(), actor, id, body)
  return { decided, shiftIds }
})
