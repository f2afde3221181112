// Replaces the operator's weather-hold levels (coordinator or safety): names, figures and advice are theirs.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety')
  const body = await readBodyAs(event, HoldsBodySchema)
  return saveHoldSettings(useDB(), actor.id, body)
})
