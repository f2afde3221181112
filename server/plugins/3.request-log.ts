// One JSON line per request for whoever runs the server, errors included: a refused (401/403), bad
// (400/404/413/415/429) or failed (5xx) request is logged like any other, from the error hook, since
// Nitro's error handler answers those without passing through `afterResponse`. Paths are logged
// without their query string and with tokens masked (feed, invitation and reset links, and any long
// token-like path segment); bodies (passwords) are never logged. Before Nitro's own handler prints an
// unexpected error with the request URL, that URL is masked the same way.
import type { H3Event } from 'h3'
import { useServerConfig } from '../utils/config'

const TOKEN_PATH = /\/(feed|welcome|invitations|reset)\/[^/?]+/gi
// a path segment that looks like a secret: 32 or more URL-safe characters
const TOKEN_SEGMENT = /\/[A-Za-z0-9_%-]{32,}(?:\.[a-z]{2,4})?(?=\/|$)/g

/** The path as it may appear in a log: no query string, no tokens. */
export function maskLoggedPath(url: string) {
  return url.split('?')[0]!.replace(TOKEN_PATH, '/$1/…').replace(TOKEN_SEGMENT, '/…')
}

function writeLine(event: H3Event, status: number, error?: string) {
  const started = event.context.startedAt as number | undefined
  const line = {
    at: nowDate().toISOString(),
    method: event.method,
    path: maskLoggedPath(event.path),
    status,
    ms: started === undefined ? null : Math.round((performance.now() - started) * 10) / 10,
    ...(error ? { error } : {})
  }
  event.context.requestLogged = true
  console.info(JSON.stringify(line))
}

export default defineNitroPlugin((nitroApp) => {
  const enabled = useServerConfig().requestLog
  nitroApp.hooks.hook('request', (event) => {
    event.context.startedAt = performance.now()
  })
  nitroApp.hooks.hook('error', (error, { event }) => {
    if (!event) return
    const status = (error as { statusCode?: number }).statusCode ?? 500
    if (enabled && !event.context.requestLogged) writeLine(event, status, status >= 500 ? 'server error' : undefined)
    // Nitro's handler logs unexpected errors with the full URL: give it the masked one
    const masked = maskLoggedPath(event.path)
    if (masked !== event.path) (event as unknown as { _path: string })._path = masked
  })
  if (!enabled) return
  nitroApp.hooks.hook('afterResponse', (event) => {
    if (!event.context.requestLogged) writeLine(event, event.node.res.statusCode)
  })
})
