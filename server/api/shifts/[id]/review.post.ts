import { IdParamsSchema } from '../../../utils/validation'

// Records a safety decision on a shift waiting for review (safety only); see recordReviewDecision for
// the rules. A rejection or a send-back mails the coordinators, with a link back to the shift.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, ReviewBodySchema)
  const decision = recordReviewDecision(useDB(), actor, id, body, { baseUrl: resolvePublicBaseUrl(event) })
  setResponseStatus(event, 201)
  return { ...decision, shift: findShiftView(useDB(), id)! }
})
