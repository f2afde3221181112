// The signed-in person's private calendar feed URL (fetchable without a session; see server/utils/feed.ts
// for how the token is derived so that only its hash is stored).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const token = issueFeedToken(useDB(), user.id, readFeedSecret())
  return { url: `${resolvePublicBaseUrl(event)}/feed/${token}.ics` }
})
