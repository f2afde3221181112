// A new feed URL for the signed-in person; the old one answers 404 from now on.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const db = useDB()
  const token = rotateFeedToken(db, user.id, readFeedSecret())
  recordAudit(db, user.id, 'feed.regenerate', 'person', user.id)
  return { url: `${resolvePublicBaseUrl(event)}/feed/${token}.ics` }
})
