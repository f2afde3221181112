// Validators and compression on the week, light and feed replies (RFC 9110 §8.8.3 ETag, §13.1.2
// If-None-Match, §15.4.5 304 Not Modified; RFC 9112/9110 Content-Encoding with gzip, RFC 1952, and
// br, RFC 7932). Every compressed body is decoded with Node's own zlib and must equal the plain one.
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ApiClient, AppServer } from '../support/app-server'
import { signedInClient, startAppServer } from '../support/app-server'

let server: AppServer
let coordinator: ApiClient
let crew: ApiClient

beforeAll(async () => {
  server = await startAppServer({ env: { REMINDER_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  crew = await signedInClient(server, 'crew@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

// Node's fetch decodes bodies itself: read the raw bytes over http.get instead.
async function rawGet(path: string, headers: Record<string, string>) {
  const { request } = await import('node:http')
  return new Promise<{ status: number, headers: Record<string, string | string[] | undefined>, body: Buffer }>((res, rej) => {
    const req = request(`${server.url}${path}`, { headers }, (reply) => {
      const chunks: Buffer[] = []
      reply.on('data', (c: Buffer) => chunks.push(c))
      reply.on('end', () => res({ status: reply.statusCode!, headers: reply.headers, body: Buffer.concat(chunks) }))
      reply.on('error', rej)
    })
    req.on('error', rej)
    req.end()
  })
}

const WEEK = '/api/shifts?from=2026-11-30&to=2026-12-07'
const LIGHT = '/api/light?lat=78.22&lon=15.63&tz=Arctic/Longyearbyen&from=2026-03-01&to=2026-03-31'

describe.each([['the week', WEEK], ['the light', LIGHT]])('%s reply', (_name, path) => {
  it('is the same JSON plain, gzip and br, with one ETag and Vary: Accept-Encoding', async () => {
    const cookie = coordinator.cookie
    const plain = await rawGet(path, { cookie })
    const gzip = await rawGet(path, { cookie, 'accept-encoding': 'gzip' })
    const br = await rawGet(path, { cookie, 'accept-encoding': 'gzip, deflate, br' })
    expect([plain.status, gzip.status, br.status]).toEqual([200, 200, 200])
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(gzip.headers['content-encoding']).toBe('gzip')
    expect(br.headers['content-encoding']).toBe('br')
    expect(gunzipSync(gzip.body).equals(plain.body)).toBe(true)
    expect(brotliDecompressSync(br.body).equals(plain.body)).toBe(true)
    expect(br.body.length).toBeLessThan(plain.body.length / 3)
    expect(JSON.parse(plain.body.toString('utf8'))).toBeTruthy()
    expect(plain.headers.etag).toMatch(/^W\/"[A-Za-z0-9_-]+"$/)
    expect(gzip.headers.etag).toBe(plain.headers.etag)
    expect(br.headers.etag).toBe(plain.headers.etag)
    expect(plain.headers.vary).toMatch(/Accept-Encoding/i)
  })

  it('answers 304 with no body to a matching If-None-Match, and 200 to a stale one', async () => {
    const cookie = coordinator.cookie
    const first = await rawGet(path, { cookie })
    const again = await rawGet(path, { cookie, 'if-none-match': String(first.headers.etag) })
    expect(again.status).toBe(304)
    expect(again.body.length).toBe(0)
    expect(again.headers.etag).toBe(first.headers.etag)
    const stale = await rawGet(path, { cookie, 'if-none-match': 'W/"not-this-one"' })
    expect(stale.status).toBe(200)
    expect(stale.body.equals(first.body)).toBe(true)
  })

  it('still needs a session: no reply, no ETag without one', async () => {
    const anonymous = await rawGet(path, {})
    expect(anonymous.status).toBe(401)
    expect(anonymous.headers.etag).toBeUndefined()
  })
})

describe('the week reply after a change', () => {
  it('gets a new ETag and the new content as soon as a shift changes', async () => {
    const before = await rawGet(WEEK, { cookie: coordinator.cookie })
    const list = JSON.parse(before.body.toString('utf8')) as { id: number, title: string, version: number }[]
    expect(list.length).toBeGreaterThan(0)
    const target = list[0]!
    const patched = await coordinator.patch(`/api/shifts/${target.id}`, { title: `${target.title} (renamed)`, version: target.version })
    expect(patched.status, JSON.stringify(patched.body)).toBe(200)
    const after = await rawGet(WEEK, { 'cookie': coordinator.cookie, 'if-none-match': String(before.headers.etag) })
    expect(after.status).toBe(200)
    expect(after.headers.etag).not.toBe(before.headers.etag)
    const renamed = (JSON.parse(after.body.toString('utf8')) as { id: number, title: string }[]).find(s => s.id === target.id)
    expect(renamed?.title).toBe(`${target.title} (renamed)`)
  })

  it('a crew member and a coordinator asking for the same week get their own replies', async () => {
    const mine = await rawGet(WEEK, { cookie: crew.cookie })
    const all = await rawGet(WEEK, { cookie: coordinator.cookie })
    expect(mine.status).toBe(200)
    const me = (await crew.get('/api/auth/me')).body.user.id
    const mineList = JSON.parse(mine.body.toString('utf8')) as { assigneeIds: number[] }[]
    expect(mineList.length).toBeGreaterThan(0)
    expect(mineList.every(s => s.assigneeIds.includes(me))).toBe(true)
    expect(JSON.parse(all.body.toString('utf8')).length).toBeGreaterThanOrEqual(mineList.length)
  })
})

describe('the calendar feed reply', () => {
  it('has an ETag, answers 304 to it, compresses, and changes when the person\'s shifts do', async () => {
    const { url } = (await crew.get('/api/me/feed')).body as { url: string }
    const path = new URL(url).pathname
    const first = await rawGet(path, {})
    expect(first.status).toBe(200)
    expect(first.headers['content-type']).toMatch(/^text\/calendar/)
    expect(first.body.toString('utf8')).toMatch(/^BEGIN:VCALENDAR\r\n/)
    expect(first.headers.etag).toMatch(/^W\/"/)
    const again = await rawGet(path, { 'if-none-match': String(first.headers.etag) })
    expect(again.status).toBe(304)
    expect(again.body.length).toBe(0)
    const gzip = await rawGet(path, { 'accept-encoding': 'gzip' })
    expect(gzip.headers['content-encoding']).toBe('gzip')
    expect(gunzipSync(gzip.body).equals(first.body)).toBe(true)
    // a new shift for this person: the feed's text and ETag change at once
    const me = (await crew.get('/api/auth/me')).body.user.id as number
    const site = (await coordinator.get('/api/sites')).body[0] as { id: number }
    const made = await coordinator.post('/api/shifts', { siteId: site.id, title: 'Feed cache check', light: 'any', assigneeIds: [me], overrideReason: 'cache test', start: '2026-12-10T10:00', end: '2026-12-10T12:00' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    const after = await rawGet(path, { 'if-none-match': String(first.headers.etag) })
    expect(after.status).toBe(200)
    expect(after.headers.etag).not.toBe(first.headers.etag)
    expect(after.body.toString('utf8')).toContain(`UID:shift-${made.body.id}@gloamline`)
  })

  it('an unknown token still gets the bare 404, with no ETag', async () => {
    const reply = await rawGet(`/feed/${'B'.repeat(43)}.ics`, {})
    expect(reply.status).toBe(404)
    expect(reply.headers.etag).toBeUndefined()
  })
})
