// The review queue: flagged shifts in one review state (default: waiting), soonest first, each with
// its light strip, cold figures, crew and cautions. Safety decides; coordinators may read it.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'safety', 'coordinator')
  const query = readQueryAs(event, ReviewQueueQuerySchema)
  return buildReviewQueue(useDB(), query)
})
