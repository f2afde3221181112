// Every route under server/api (and the feed), driven over the running server with fast-check:
// every query parameter of every GET route and every body of every write route, from hostile values
// (impossible dates and times, years outside the light engine's range, numbers that are not, zones
// that do not exist, random text) and from valid bodies with one field made hostile. The property:
// never a 5xx, never a stack trace. The parameter names come from the route files themselves (and a
// shared vocabulary), so a new route or parameter is covered without editing this file.
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'

const API_DIR = resolve(import.meta.dirname, '../../server/api')
const SOURCE_DIRS = [resolve(import.meta.dirname, '../../server/services'), resolve(import.meta.dirname, '../../server/utils'), resolve(import.meta.dirname, '../../shared/schemas')]
const RUNS_PER_ROUTE = Number(process.env.ROUTE_PROPERTY_RUNS || 24)
const ROLES = ['coordinator', 'safety', 'crew'] as const
type Role = typeof ROLES[number]

function listRouteFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    return statSync(full).isDirectory() ? listRouteFiles(full) : [relative(API_DIR, full).replace(/\.ts$/, '')]
  })
}

// names a schema in a route or the schemas it uses: `key: z.…`, `key: SomeSchema`, `key: numberBetween(…)`
const KEY_PATTERN = /(?:^|[{,\s])([a-zA-Z][a-zA-Z0-9]*)\??:\s*(?:z\.|[A-Z][A-Za-z]*Schema\b|numberBetween|singleLineText|realDateTime|readingNumber)/g
function keysIn(text: string): string[] {
  return [...new Set([...text.matchAll(KEY_PATTERN)].map(m => m[1]!))]
}
// the schemas a route names (SomethingSchema) and where they are defined
const schemaSources = SOURCE_DIRS.flatMap(dir => readdirSync(dir).filter(f => f.endsWith('.ts')).map(f => readFileSync(join(dir, f), 'utf8')))
function keysOfRoute(file: string): string[] {
  const text = readFileSync(join(API_DIR, `${file}.ts`), 'utf8')
  const keys = new Set(keysIn(text))
  for (const name of new Set(text.match(/\b[A-Z][A-Za-z]*Schema\b/g) ?? [])) {
    for (const source of schemaSources) {
      const at = source.indexOf(`const ${name} =`)
      if (at < 0) continue
      // the definition: up to the next top-level declaration
      const rest = source.slice(at)
      const end = rest.slice(1).search(/\n(export |const |function |\/\*\*)/)
      for (const k of keysIn(end < 0 ? rest : rest.slice(0, end + 1))) keys.add(k)
    }
  }
  return [...keys]
}

const QUERY_VOCABULARY = ['from', 'to', 'date', 'year', 'lat', 'lon', 'tz', 'siteId', 'state', 'status', 'limit', 'beforeId', 'kind', 'minCivilHours', 'temperature', 'wind', 'units', 'sunUp', 'crewId', 'version', 'at']
const BODY_VOCABULARY = ['siteId', 'title', 'start', 'end', 'light', 'assigneeIds', 'version', 'name', 'email', 'role', 'from', 'to', 'date', 'at', 'latitude', 'longitude', 'timezone', 'durationMinutes']

const IMPOSSIBLE_TIMES = ['2026-02-30T10:00', '2026-03-01T10:60', '2026-03-01T99:99', '2026-13-01T10:00', '2026-03-01T24:00', '2026-03-01T23:59:60', '2026-02-30T10:00:00Z', '2026-03-01T10:00:00+25:00']
// the first and last days the product takes in, and the years just outside (shared/schemas/calendar.ts)
const EDGES = ['1902-01-01', '2148-12-31', '1902-01-01T00:00', '2148-12-31T23:59', '2148-12-31T23:59:59Z', '1902-01-01T00:00:00+14:00', '2148-12-31T23:00:00-12:00', '1901-12-31', '2149-01-01', '1902', '2148']
const OUT_OF_RANGE = ['2150-01-01', '1900-01-01', '9999-12-31', '0001-01-01', '2149-12-31', '1901-01-01', '2150-01-01T10:00', '0001-01-01T10:00', '9999-12-31T23:59:59Z', '1900', '2150', '9999', '0001', '2149', '1901']
const NUMBERS_THAT_ARE_NOT = ['1e309', '-1', '0', 'NaN', 'Infinity', '-0', '1.5', '99999999999999999999', '0x10', ' ', '']
const ZONES = ['Mars/Olympus', 'UTC', 'Antarctica/Troll', 'Australia/Lord_Howe', 'Etc/GMT+12', '../../etc/passwd']
const DOMAIN_VALUES = [...IMPOSSIBLE_TIMES, ...EDGES, ...OUT_OF_RANGE, ...NUMBERS_THAT_ARE_NOT, ...ZONES]
const DATED_VALUES = [...IMPOSSIBLE_TIMES, ...EDGES, ...OUT_OF_RANGE].filter(v => /^\d{4}-\d{2}-\d{2}/.test(v))

// the base with every date field on the date of `value` (and its time, for start and at)
function movedTo(base: Record<string, unknown>, value: string): Record<string, unknown> {
  const date = value.slice(0, 10)
  const time = value.length > 10 ? value.slice(10) : 'T10:00'
  const out: Record<string, unknown> = { ...base }
  for (const key of Object.keys(base)) {
    if (['from', 'to', 'date'].includes(key)) out[key] = typeof base[key] === 'string' && (base[key] as string).includes('T') ? `${date}${time}` : date
    if (key === 'start' || key === 'at') out[key] = `${date}${time}`
    if (key === 'end') out[key] = `${date}T23:59`
  }
  return out
}
const HOSTILE_TEXT = fc.oneof(
  fc.constantFrom(...IMPOSSIBLE_TIMES, ...EDGES, ...OUT_OF_RANGE, ...NUMBERS_THAT_ARE_NOT, ...ZONES, 'daylight', 'civil', 'any', 'pending', 'approved', 'metric', 'imperial', 'true', 'false'),
  fc.string({ maxLength: 40 }),
  fc.date({ min: new Date(-62_000_000_000_000), max: new Date(253_000_000_000_000), noInvalidDate: true }).map(d => d.toISOString()),
  fc.integer({ min: -5, max: 100_000 }).map(String)
)
const HOSTILE_JSON = fc.oneof(
  HOSTILE_TEXT, fc.double(), fc.integer(), fc.constantFrom(Number.MAX_SAFE_INTEGER, -1, 0, 1e300, 1901, 2149, 2150), fc.boolean(), fc.constant(null),
  fc.array(fc.oneof(fc.integer({ min: -2, max: 40 }), HOSTILE_TEXT), { maxLength: 4 }), fc.object({ maxDepth: 1 })
)

let server: AppServer
let cases = 0
const clients: Partial<Record<Role, ApiClient>> = {}
// valid bodies and queries of the main routes, some at the ends of the year range; one or two fields
// at a time are made hostile, so a bad value reaches past the checks of the others
let BASES: Record<string, Record<string, unknown>[]> = {}
let throwawayPersonId = 0

beforeAll(async () => {
  server = await startAppServer({ clockStart: TEST_CLOCK.saturdayEveningBeforeChange, env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off', FIELD_ALERT_TIMER: 'off' } })
  for (const role of ROLES) clients[role] = await signedInClient(server, `${role}@gloamline.test`)
  const person = await clients.coordinator!.post('/api/people', { name: 'Property Target', email: 'property.target@northwake.test', role: 'crew' })
  throwawayPersonId = person.body.person?.id ?? person.body.id
  const shift = { siteId: 1, title: 'Property shift', start: '2027-03-28T01:30', end: '2027-03-28T05:00', light: 'civil', assigneeIds: [] }
  const lastDay = { ...shift, start: '2148-12-31T20:00', end: '2148-12-31T23:30' }
  const firstDay = { ...shift, start: '1902-01-01T00:30', end: '1902-01-01T03:00' }
  BASES = {
    'shifts/index.post': [shift, lastDay, firstDay],
    'shifts/check.post': [shift, lastDay, firstDay],
    'shifts/[id].patch': [{ start: '2027-03-29T09:00', end: '2027-03-29T12:00' }, { start: '2148-12-31T22:00', end: '2148-12-31T23:59' }],
    'sites/index.post': [{ name: 'Property site', latitude: 69.6, longitude: 18.9, timezone: 'Europe/Oslo' }],
    'sites/[id].patch': [{ name: 'Property site renamed' }, { latitude: -77.8, longitude: 166.7, timezone: 'Antarctica/Troll' }],
    'sites/[id]/observations/index.post': [{ at: '2027-03-27T20:00', temperature: -12, wind: 20, units: 'metric' }],
    'slots/search.post': [
      { siteId: 1, durationMinutes: 60, light: 'daylight', from: '2027-04-01', to: '2027-04-03', assigneeIds: [3] },
      { siteId: 1, durationMinutes: 60, light: 'any', from: '2148-12-20', to: '2148-12-31', assigneeIds: [3] },
      { siteId: 6, durationMinutes: 60, light: 'any', from: '1902-01-01', to: '1902-01-05', assigneeIds: [3] }
    ],
    'unavailability/index.post': [{ personId: 3, start: '2027-04-10T08:00', end: '2027-04-11T08:00', reason: 'Leave' }],
    'shifts/[id]/review.post': [{ decision: 'approved', mitigations: ['portable-lighting'], note: 'ok', version: 1 }],
    'people/index.post': [{ name: 'Another Property', email: 'another.property@northwake.test', role: 'crew' }],
    'light.get': [{ lat: '70', lon: '20', tz: 'Europe/Oslo', from: '2027-03-27', to: '2027-03-29' }, { lat: '-89', lon: '179.9', tz: 'Pacific/Kiritimati', from: '2148-12-01', to: '2148-12-31' }, { lat: '89', lon: '-179.9', tz: 'Etc/GMT+12', from: '1902-01-01', to: '1902-01-03' }],
    'seasons.get': [{ lat: '70', lon: '20', tz: 'UTC', year: '2027' }, { lat: '-78', lon: '166', tz: 'Antarctica/McMurdo', year: '2148' }, { lat: '78', lon: '15', tz: 'Arctic/Longyearbyen', year: '1902' }],
    'sites/[id]/light.get': [{ from: '2027-03-27', to: '2027-03-28' }, { from: '2148-12-30', to: '2148-12-31' }, { from: '1902-01-01', to: '1902-01-02' }],
    'sites/[id]/seasons.get': [{ year: '2027' }, { year: '2148' }, { year: '1902' }],
    'sites/[id]/year.get': [{ year: '2027' }, { year: '2148' }, { year: '1902' }],
    'sites/[id]/runup.get': [{ from: '2027-03-27' }, { from: '2148-12-31' }, { from: '1902-01-01' }],
    'cold.get': [{ temperature: '-20', wind: '30', units: 'metric' }],
    'shifts/index.get': [{ from: '2027-03-27', to: '2027-03-30' }, { from: '2148-12-01', to: '2148-12-31' }],
    'board.get': [{ minCivilHours: '4' }],
    'sites/[id]/observations/index.get': [{ from: '2027-03-01T00:00:00Z', to: '2027-03-27T00:00:00Z' }],
    'review/queue.get': [{ state: 'pending', from: '2027-03-27', to: '2027-04-27' }],
    'reminders/run.post': [{ date: '2148-12-31' }]
  }
})
afterAll(async () => {
  await server?.stop()
  console.info(`[properties] route cases run: ${cases}`)
})

const files = listRouteFiles(API_DIR)
// routes that end or change this test's own sessions and sign-in counters run last
const LAST = ['auth/login.post', 'auth/password.post', 'auth/forgot.post', 'auth/reset.post', 'auth/invitation.post', 'auth/logout-others.post', 'auth/logout.post']
const ordered = [...files.filter(f => !LAST.includes(f)), ...LAST.filter(f => files.includes(f))]

function pathFor(file: string, id: string) {
  return '/api/' + file.replace(/\.[a-z]+$/, '').replace(/(^|\/)index$/, '').replace(/\[[^\]]+\]/g, id).replace(/\/$/, '')
}

async function roleFor(method: string, path: string): Promise<Role> {
  for (const role of ROLES) {
    const reply = await clients[role]!.request(method, path, method === 'GET' ? undefined : {})
    if (reply.status !== 403) return role
  }
  return 'coordinator'
}

function expectNoServerError(reply: { status: number, body: unknown }, what: string) {
  cases++
  expect(reply.status, what).toBeLessThan(500)
  expect(JSON.stringify(reply.body) ?? '', what).not.toMatch(/\bat .*\.(mjs|js|ts):\d+/)
}

describe('every route under hostile input', () => {
  it('finds the routes and their parameters', () => {
    expect(files.length).toBeGreaterThan(40)
    expect(keysOfRoute('light.get')).toEqual(expect.arrayContaining(['lat', 'lon', 'tz']))
    expect(keysOfRoute('shifts/index.post')).toEqual(expect.arrayContaining(['siteId', 'start', 'end', 'light']))
  })

  for (const file of ordered) {
    const method = file.split('.').pop()!.toUpperCase()
    it(`${method} ${pathFor(file, ':id')} never answers 5xx (${RUNS_PER_ROUTE} hostile cases, more from a valid body)`, async () => {
      const keys = [...new Set([...keysOfRoute(file), ...(method === 'GET' ? QUERY_VOCABULARY : BODY_VOCABULARY)])]
      const realId = file.startsWith('people/') ? String(throwawayPersonId) : '1'
      const ids = file.includes('[') ? fc.oneof(fc.constant(realId), fc.constant(realId), fc.constantFrom('0', '-1', '1e309', 'abc', '99999999999999999999', '2')) : fc.constant('1')
      const role = await roleFor(method, pathFor(file, realId))
      const client = clients[role]!
      const send = (id: string, params: Record<string, unknown>, asQuery: boolean) => {
        if (!asQuery) return client.request(method, pathFor(file, id), params)
        const q = new URLSearchParams(Object.entries(params).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)])).toString()
        return client.request(method, `${pathFor(file, id)}${q ? `?${q}` : ''}`)
      }
      const asQuery = method === 'GET' || method === 'DELETE' || file === 'reminders/run.post'
      await fc.assert(fc.asyncProperty(ids, fc.dictionary(fc.constantFrom(...keys), asQuery ? HOSTILE_TEXT : HOSTILE_JSON, { maxKeys: 6 }), async (id, params) => {
        const reply = await send(id, params, asQuery)
        expectNoServerError(reply, `${method} ${pathFor(file, id)} ${JSON.stringify(params)}`)
      }), { numRuns: RUNS_PER_ROUTE })
      const bases = BASES[file] ?? []
      for (const base of bases) {
        // the valid base itself never fails with a 5xx either (the ends of the year range included)
        expectNoServerError(await send(realId, base, asQuery), `${method} ${pathFor(file, realId)} ${JSON.stringify(base)}`)
        const baseKeys = Object.keys(base)
        // every listed hostile value in every field; every listed date moved into all the date fields
        // at once (a range or a shift wholly in year 0001 or 2150); then random values in one or two fields
        const variants = [
          ...baseKeys.flatMap(key => DOMAIN_VALUES.map(hostile => ({ ...base, [key]: hostile }))),
          ...DATED_VALUES.map(date => movedTo(base, date))
        ]
        for (const params of variants) {
          expectNoServerError(await send(realId, params, asQuery), `${method} ${pathFor(file, realId)} ${JSON.stringify(params)}`)
        }
        const value = asQuery ? HOSTILE_TEXT : HOSTILE_JSON
        await fc.assert(fc.asyncProperty(fc.constantFrom(...baseKeys), value, fc.option(fc.tuple(fc.constantFrom(...baseKeys), value)), async (key, hostile, second) => {
          const params = { ...base, [key]: hostile, ...(second ? { [second[0]]: second[1] } : {}) }
          const reply = await send(realId, params, asQuery)
          expectNoServerError(reply, `${method} ${pathFor(file, realId)} ${JSON.stringify(params)}`)
        }), { numRuns: RUNS_PER_ROUTE * 2 })
      }
    }, 120_000)
  }
})

describe('the feed and health routes', () => {
  it('never answer 5xx for hostile tokens', async () => {
    await fc.assert(fc.asyncProperty(fc.string({ maxLength: 80 }), async (token) => {
      const reply = await new ApiClient(server.url).get(`/feed/${encodeURIComponent(token)}.ics`)
      expectNoServerError(reply, `/feed/${token}`)
    }), { numRuns: RUNS_PER_ROUTE })
  })
})
