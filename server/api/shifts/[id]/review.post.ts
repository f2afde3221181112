import { IdParamsSchema } from '../../../utils/validation'

// Records a safety decision on a flagged shift (safety only); see recordReviewDecision for the rules.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, ReviewBodySchema)
  const decision = recordReviewDecision(useDB(), actor, id, body)
  setResponseStatus(event, 201)
  return { ...decision, shift: findShiftView(useDB(), id)! }
})
