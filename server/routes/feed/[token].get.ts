// The public calendar feed: outside /api, no session; the token in the path is the credential.
// Any token that is malformed, unknown, regenerated away or belongs to an inactive person gets the
// same bare plain-text 404 (not the usual JSON error, which would echo the URL), so the answer
// reveals nothing about which tokens or people exist.
export default defineEventHandler(async (event) => {
  const raw = getRouterParam(event, 'token') ?? ''
  const token = raw.endsWith('.ics') ? raw.slice(0, -4) : raw
  const db = useDB()
  const person = findPersonByFeedToken(db, token)
  setResponseHeader(event, 'Cache-Control', 'private, no-cache')
  setResponseHeader(event, 'X-Robots-Tag', 'noindex')
  if (!person) {
    setResponseStatus(event, 404, 'Not Found')
    setResponseHeader(event, 'Content-Type', 'text/plain; charset=utf-8')
    return 'Not found'
  }
  setResponseHeader(event, 'Content-Disposition', 'inline; filename="gloamline-shifts.ics"')
  // cached per person and database version, with an ETag: an unchanged feed answers 304
  return sendCachedReply(event, await loadPersonFeedReply(db, person, resolvePublicBaseUrl(event)))
})
