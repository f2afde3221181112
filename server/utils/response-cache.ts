import { createHash } from 'node:crypto'
import { brotliCompressSync, constants as zlibConstants, gzipSync } from 'node:zlib'
import type { H3Event } from 'h3'
import type { AppDatabase } from './db'

/**
 * One reply, serialised once: its body, a validator (weak ETag over the body, so every worker and
 * every encoding of the same content shares it) and the compressed bodies, made on first request of
 * each encoding and kept with the reply. `T` is the value the body was made from: it types the route.
 */
export interface CachedReply<T> {
  readonly etag: string
  readonly contentType: string
  readonly body: Buffer
  gzip?: Buffer
  br?: Buffer
  /** Never read: carries the reply's type to the route that sends it. */
  readonly value?: T
}

// Below this size compression saves less than its own cost.
const MIN_COMPRESS_BYTES = 1024
// Brotli quality 5: close to gzip's speed (a few ms for a 250 KiB week) at a smaller size; the
// higher qualities cost tens to hundreds of ms, which would stall every other request meanwhile.
const BROTLI_OPTIONS = { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 5 } }

/** Serialises a value once: the body, its ETag and its content type. */
export function prepareReply<T>(value: T, contentType = 'application/json; charset=utf-8', text?: string): CachedReply<T> {
  const body = Buffer.from(text ?? JSON.stringify(value), 'utf8')
  return { body, contentType, etag: `W/"${createHash('sha1').update(body).digest('base64url')}"` }
}

/** A reply whose body is text already (an iCalendar feed), with its content type. */
export function prepareTextReply(text: string, contentType: string): CachedReply<string> {
  return prepareReply<string>(text, contentType, text)
}

/**
 * A small least-recently-used cache of prepared replies. Light for a place and dates is a pure
 * function, so it caches by its inputs alone; database reads add a data stamp to the key.
 */
export function createReplyCache<T>(maxEntries = 300) {
  const entries = new Map<string, CachedReply<T>>()
  return {
    get(key: string): CachedReply<T> | undefined {
      const hit = entries.get(key)
      if (hit !== undefined) {
        entries.delete(key)
        entries.set(key, hit)
      }
      return hit
    },
    set(key: string, reply: CachedReply<T>): CachedReply<T> {
      entries.set(key, reply)
      if (entries.size > maxEntries) entries.delete(entries.keys().next().value!)
      return reply
    },
    /** The cached reply for a key, or the one `make` gives (prepared and kept). */
    remember(key: string, make: () => T): CachedReply<T> {
      return this.get(key) ?? this.set(key, prepareReply(make()))
    },
    get size() {
      return entries.size
    },
    clear: () => entries.clear()
  }
}

/** The encoding to send for an Accept-Encoding header: br, then gzip, else none. */
export function pickEncoding(accept: string | undefined): 'br' | 'gzip' | null {
  if (!accept) return null
  const allowed = (name: string) => {
    const match = new RegExp(`(?:^|,)\\s*${name}\\s*(?:;\\s*q\\s*=\\s*([0-9.]+))?\\s*(?:,|$)`, 'i').exec(accept)
    return match !== null && (match[1] === undefined || Number(match[1]) > 0)
  }
  if (allowed('br')) return 'br'
  if (allowed('gzip')) return 'gzip'
  return null
}

/** The reply's body in an encoding, compressed on first use and kept with the reply. */
export function encodeReply(reply: CachedReply<unknown>, encoding: 'br' | 'gzip' | null): Buffer {
  if (encoding === null || reply.body.length < MIN_COMPRESS_BYTES) return reply.body
  if (encoding === 'br') return reply.br ??= brotliCompressSync(reply.body, BROTLI_OPTIONS)
  return reply.gzip ??= gzipSync(reply.body, { level: 6 })
}

function matchesEtag(header: string | undefined, etag: string): boolean {
  if (!header) return false
  if (header.trim() === '*') return true
  // weak comparison (RFC 9110 8.8.3.2): W/ is ignored on both sides
  const bare = etag.replace(/^W\//, '')
  return header.split(',').some(tag => tag.trim().replace(/^W\//, '') === bare)
}

/**
 * Sends a prepared reply: 304 when the client's If-None-Match holds its ETag, else the body in the
 * best encoding the client accepts. Returns the bytes for h3 to write, typed as the reply's value so
 * that the route's return type (and `$fetch` on the client) infers it.
 */
export function sendCachedReply<T>(event: H3Event, reply: CachedReply<T>, cacheControl = 'private, no-cache'): T {
  const res = event.node.res
  res.setHeader('ETag', reply.etag)
  // a route or middleware that set its own (no-store on personal replies, say) keeps it
  if (!res.hasHeader('Cache-Control')) res.setHeader('Cache-Control', cacheControl)
  res.setHeader('Vary', 'Accept-Encoding')
  if (matchesEtag(event.node.req.headers['if-none-match'], reply.etag)) {
    res.statusCode = 304
    return Buffer.alloc(0) as unknown as T
  }
  const encoding = reply.body.length < MIN_COMPRESS_BYTES ? null : pickEncoding(event.node.req.headers['accept-encoding'])
  const bytes = encodeReply(reply, encoding)
  res.setHeader('Content-Type', reply.contentType)
  if (encoding) res.setHeader('Content-Encoding', encoding)
  res.setHeader('Content-Length', bytes.length)
  return bytes as unknown as T
}

const stampStatements = new WeakMap<object, { changes: { get: () => unknown } }>()

/**
 * Changes whenever the database does: total_changes() counts every row this connection wrote, and
 * data_version moves when another connection commits — another worker of the cluster, a restore, a
 * maintenance script. So a reply cached in one worker is never served after a write in another.
 */
export function readDataStamp(db: AppDatabase): string {
  let statements = stampStatements.get(db.$client)
  if (!statements) {
    statements = { changes: db.$client.prepare('select total_changes() as n').pluck() }
    stampStatements.set(db.$client, statements)
  }
  return `${statements.changes.get()}:${db.$client.pragma('data_version', { simple: true })}`
}
