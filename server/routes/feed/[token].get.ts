// The public calendar feed: outside /api, no session; the token in the path is the credential.
// Any token that is malformed, unknown, regenerated away or belongs to an inactive person gets the
// same bare 404, so the answer reveals nothing about which tokens or people exist.
export default defineEventHandler((event) => {
  const raw = getRouterParam(event, 'token') ?? ''
  const token = raw.endsWith('.ics') ? raw.slice(0, -4) : raw
  const db = useDB()
  const person = findPersonByFeedToken(db, token)
  if (!person) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: 'Not found' })
  setResponseHeaders(event, {
    'Content-Type': 'text/calendar; charset=utf-8',
    'Content-Disposition': 'inline; filename="gloamline-shifts.ics"',
    'Cache-Control': 'private, no-cache',
    'X-Robots-Tag': 'noindex'
  })
  return buildPersonFeed(db, person, { homeUrl: resolvePublicBaseUrl(event) })
})
