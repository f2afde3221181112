import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

// Random and hostile bodies against the built server (fast-check): never a 5xx, never a stack
// trace, and text that is accepted is stored and returned exactly as sent.
let server: AppServer
let coordinator: ApiClient
let safety: ApiClient

const HOSTILE_VALUE = fc.oneof(
  fc.string({ maxLength: 300 }), fc.string({ unit: 'grapheme', maxLength: 100 }),
  fc.constantFrom('1\' OR \'1\'=\'1', 'Robert"); DROP TABLE shifts;--', '<script>alert(1)</script>', '\u0000', 'NaN', '1e309', '-0', '../../x'),
  fc.double(), fc.integer(), fc.constantFrom(Number.MAX_SAFE_INTEGER, -1, 0, 1e300), fc.boolean(), fc.constant(null),
  fc.array(fc.oneof(fc.integer(), fc.string()), { maxLength: 5 }), fc.object({ maxDepth: 2 })
)

function bodyWith(keys: string[]) {
  return fc.record(Object.fromEntries(keys.map(k => [k, HOSTILE_VALUE])), { requiredKeys: [] })
}

beforeAll(async () => {
  server = await startAppServer({ env: { REQUEST_LOG: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  safety = await signedInClient(server, 'safety@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

const TARGETS: [string, string, string[], 'coordinator' | 'safety'][] = [
  ['POST', '/api/sites', ['name', 'latitude', 'longitude', 'timezone', 'elevation', 'defaultLight'], 'coordinator'],
  ['POST', '/api/shifts', ['siteId', 'title', 'start', 'end', 'light', 'assigneeIds'], 'coordinator'],
  ['PATCH', '/api/shifts/1', ['start', 'end', 'light', 'assigneeIds', 'version', 'title'], 'coordinator'],
  ['POST', '/api/people', ['name', 'email', 'role'], 'coordinator'],
  ['POST', '/api/shifts/1/review', ['decision', 'mitigations', 'note', 'version'], 'safety'],
  ['POST', '/api/slots/search', ['siteId', 'durationMinutes', 'light', 'from', 'to', 'assigneeIds'], 'coordinator'],
  ['POST', '/api/auth/login', ['email', 'password'], 'coordinator']
]

describe('hostile bodies', () => {
  for (const [method, path, keys, role] of TARGETS) {
    it(`${method} ${path} never answers 5xx`, async () => {
      await fc.assert(fc.asyncProperty(bodyWith(keys), async (body) => {
        const reply = await (role === 'safety' ? safety : coordinator).request(method, path, body)
        expect(reply.status, JSON.stringify(body)).toBeLessThan(500)
        expect(JSON.stringify(reply.body)).not.toMatch(/\bat .*\.(mjs|js|ts):\d+/)
      }), { numRuns: 40 })
    })
  }

  it('GET /api/light and /api/cold never answer 5xx for hostile query strings', async () => {
    await fc.assert(fc.asyncProperty(fc.array(fc.string({ maxLength: 40 }), { minLength: 5, maxLength: 5 }), async ([a, b, c, d, e]) => {
      const q = new URLSearchParams({ lat: a!, lon: b!, tz: c!, from: d!, to: e! })
      expect((await coordinator.get(`/api/light?${q}`)).status).toBeLessThan(500)
      const cold = new URLSearchParams({ temperature: a!, wind: b!, units: c! })
      expect((await coordinator.get(`/api/cold?${cold}`)).status).toBeLessThan(500)
    }), { numRuns: 40 })
  })
})

describe('text is kept verbatim', () => {
  it('stores and returns site names and shift titles exactly as sent', async () => {
    await fc.assert(fc.asyncProperty(fc.string({ unit: 'grapheme', minLength: 1, maxLength: 80 }).filter(s => s.trim() === s && s.trim().length > 0), async (text) => {
      const site = await coordinator.post('/api/sites', { name: `${text} ${Math.random()}`, latitude: 69.6, longitude: 18.9, timezone: 'Europe/Oslo' })
      expect(site.status).toBe(201)
      const stored = await coordinator.get(`/api/sites/${site.body.id}`)
      expect(stored.body.name).toBe(site.body.name)
      const shift = await coordinator.post('/api/shifts', { siteId: site.body.id, title: text, start: '2027-01-10T10:00:00+01:00', end: '2027-01-10T12:00:00+01:00', light: 'any', assigneeIds: [] })
      expect(shift.status).toBe(201)
      expect((await coordinator.get(`/api/shifts/${shift.body.id}`)).body.title).toBe(text)
    }), { numRuns: 15 })
  })

  it('keeps SQL-looking text as plain text', async () => {
    const title = 'Survey\'); DELETE FROM shifts; --'
    const sites = await coordinator.get('/api/sites')
    const shift = await coordinator.post('/api/shifts', { siteId: sites.body[0].id, title, start: '2027-01-11T10:00:00Z', end: '2027-01-11T11:00:00Z', light: 'any', assigneeIds: [] })
    expect((await coordinator.get(`/api/shifts/${shift.body.id}`)).body.title).toBe(title)
    expect((await coordinator.get('/api/shifts')).body.length).toBeGreaterThan(10)
  })
})
