// Personal replies must not stay in a browser's or proxy's cache: every API reply and page is
// `Cache-Control: no-store` unless its route sets its own policy (static build assets keep theirs).
// Over HTTPS (directly, or behind a proxy that says so) browsers are told to come back only over HTTPS.
const STATIC_FILE = /^\/(?:_nuxt|_fonts)\/|\.(?:js|mjs|css|svg|png|jpe?g|ico|woff2?|webmanifest|txt|map)$/

export const HSTS_VALUE = 'max-age=31536000'

export default defineEventHandler((event) => {
  const path = event.path.split('?')[0]!
  if (!STATIC_FILE.test(path)) setResponseHeader(event, 'Cache-Control', 'no-store')
  if (getRequestProtocol(event, { xForwardedProto: true }) === 'https') setResponseHeader(event, 'Strict-Transport-Security', HSTS_VALUE)
})
