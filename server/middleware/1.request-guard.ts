// Writes only from our own pages, and no body read whole before it is known to be small enough.
//
// - A state-changing request (POST, PUT, PATCH, DELETE) whose Origin is not the app's own, or whose
//   Sec-Fetch-Site says another site sent it ('cross-site', or 'same-site': another port or sub-domain
//   of the same host), is refused with 403. SameSite=Lax cookies travel on same-site posts, so the
//   cookie alone cannot tell our pages from a neighbour's. A request with neither header is not from a
//   browser page (a script or API client) and is judged by its session alone.
// - Such a request may carry only JSON (415 otherwise): an HTML form cannot send application/json
//   across origins without the browser asking first, and no route reads form bodies.
// - Bodies are read here, counting bytes, and refused with 413 past the limit: 1 MB for JSON, the
//   import limit for the import routes, and that larger limit only after the coordinator check.
import type { H3Event } from 'h3'
import { useServerConfig } from '../utils/config'
import { MAX_IMPORT_CSV_CHARS } from '../core/planning/csv'

const WRITE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
export const JSON_BODY_LIMIT_BYTES = 1_000_000
// an import body is JSON around the CSV text: room for escaping and multi-byte characters
export const IMPORT_BODY_LIMIT_BYTES = Math.ceil(MAX_IMPORT_CSV_CHARS * 1.25) + JSON_BODY_LIMIT_BYTES
const IMPORT_PATH = /^\/api\/import\//
const JSON_TYPE = /^application\/(?:[\w.+-]+\+)?json\s*(?:;|$)/i

function refuse(statusCode: number, statusMessage: string, message: string) {
  return createError({ statusCode, statusMessage, message })
}

function hostOf(url: string): string | null {
  try {
    return new URL(url).host.toLowerCase()
  } catch {
    return null
  }
}

/** True when the request says (by Origin or Sec-Fetch-Site) that another site's page sent it. */
export function isForeignWrite(event: H3Event): boolean {
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')?.toLowerCase()
  if (fetchSite === 'cross-site' || fetchSite === 'same-site') return true
  const origin = getRequestHeader(event, 'origin')
  if (origin === undefined) return false
  const originHost = hostOf(origin)
  const own = [getRequestHeader(event, 'host')?.toLowerCase(), hostOf(useServerConfig().publicBaseUrl)]
  return !originHost || !own.includes(originHost)
}

function readCappedBody(event: H3Event, limit: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const req = event.node.req
    const chunks: Buffer[] = []
    let size = 0
    req.on('data', (chunk: Buffer) => {
      size += chunk.length
      if (size > limit) {
        req.removeAllListeners('data')
        req.resume()
        reject(refuse(413, 'Payload Too Large', `The request body is larger than ${Math.round(limit / 1_000_000)} MB`))
        return
      }
      chunks.push(chunk)
    })
    req.on('end', () => resolve(Buffer.concat(chunks)))
    req.on('error', reject)
  })
}

export default defineEventHandler(async (event) => {
  if (!WRITE_METHODS.has(event.method)) return
  if (isForeignWrite(event)) throw refuse(403, 'Forbidden', 'This request came from another site\'s page and was refused')
  const type = getRequestHeader(event, 'content-type')
  const length = Number.parseInt(getRequestHeader(event, 'content-length') ?? '', 10)
  const hasBody = (Number.isFinite(length) && length > 0) || getRequestHeader(event, 'transfer-encoding') !== undefined
  if ((hasBody || type !== undefined) && !JSON_TYPE.test(type ?? '')) {
    throw refuse(415, 'Unsupported Media Type', 'Send the request body as application/json')
  }
  if (!hasBody) return
  let limit = JSON_BODY_LIMIT_BYTES
  if (IMPORT_PATH.test(event.path)) {
    await requireRole(event, 'coordinator')
    limit = IMPORT_BODY_LIMIT_BYTES
  }
  if (Number.isFinite(length) && length > limit) throw refuse(413, 'Payload Too Large', `The request body is larger than ${Math.round(limit / 1_000_000)} MB`)
  // h3's readBody takes a body already read from here instead of reading the stream again
  ;(event as unknown as { _requestBody: Buffer })._requestBody = await readCappedBody(event, limit)
})
