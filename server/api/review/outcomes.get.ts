// Shifts rejected or sent back by safety review that have not ended yet, however far ahead: what the
// coordinator has to re-plan. Coordinators and safety officers may read it.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator', 'safety')
  return listReviewOutcomes(useDB())
})
