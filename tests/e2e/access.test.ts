import { readdirSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { RECIPES, type RecipeKit } from './access-recipes'

type Role = 'coordinator' | 'safety' | 'crew'
const ALL: Role[] = ['coordinator', 'safety', 'crew']

// Every route file under server/api and who may call it. A route file missing here fails the
// test, so a new route cannot skip its access check. 'public' routes need no session.
const ACCESS: Record<string, Role[] | 'public'> = {
  'auth/login.post': 'public',
  'auth/logout.post': 'public',
  // public: forgot answers the same for anyone; reset's token in the body is the credential
  'auth/forgot.post': 'public',
  'auth/reset.post': 'public',
  'auth/password.post': ALL,
  'auth/sessions.get': ALL,
  'auth/logout-others.post': ALL,
  'people/[id]/password-link.post': ['coordinator'],
  'auth/me.get': ALL,
  'people/index.get': ALL,
  'people/index.post': ['coordinator'],
  'people/[id].get': ALL,
  'people/[id].patch': ['coordinator'],
  'sites/index.get': ALL,
  'sites/index.post': ['coordinator'],
  'sites/[id].get': ALL,
  'shifts/index.get': ALL,
  'shifts/index.post': ['coordinator'],
  'shifts/[id].get': ALL,
  'shifts/[id].patch': ['coordinator'],
  'light.get': ALL,
  'seasons.get': ALL,
  'sites/[id]/light.get': ALL,
  'sites/[id]/seasons.get': ALL,
  'cold.get': ALL,
  'shifts/[id]/review.post': ['safety'],
  'shifts/[id]/reviews.get': ['safety', 'coordinator'],
  'shifts/[id]/departure.post': ALL,
  'shifts/[id]/check-in.post': ALL,
  'shifts/[id]/return.post': ALL,
  'shifts/[id]/field.get': ALL,
  'field.get': ['coordinator', 'safety'],
  'me/field.get': ALL,
  'settings/field.get': ALL,
  'settings/field.patch': ['coordinator', 'safety'],
  'settings/holds.get': ALL,
  'settings/holds.patch': ['coordinator', 'safety'],
  'review/queue.get': ['safety', 'coordinator'],
  'review/[id].get': ['safety', 'coordinator'],
  'review/outcomes.get': ['safety', 'coordinator'],
  'sites/[id]/forecast.get': ALL,
  'sites/[id]/forecast/refresh.post': ['safety', 'coordinator'],
  'sites/[id]/observations/index.get': ALL,
  'sites/[id]/observations/index.post': ['safety', 'coordinator'],
  'sites/[id]/observations/upload.post': ['safety', 'coordinator'],
  'sites/[id].patch': ['coordinator'],
  'sites/[id]/archive.post': ['coordinator'],
  'sites/zone-suggestion.get': ALL,
  'crews/index.get': ALL,
  'crews/index.post': ['coordinator'],
  'crews/[id].patch': ['coordinator'],
  'crews/[id].delete': ['coordinator'],
  'unavailability/index.get': ALL,
  'unavailability/index.post': ['coordinator'],
  'unavailability/[id].delete': ['coordinator'],
  'settings/work-rules.get': ALL,
  'settings/work-rules.patch': ['coordinator'],
  'shifts/[id].delete': ['coordinator'],
  'rotations/index.post': ['coordinator'],
  'rotations/preview.post': ['coordinator'],
  'rotations/copy-week.post': ['coordinator'],
  'rotations/index.get': ['coordinator', 'safety'],
  'rotations/[id].get': ['coordinator', 'safety'],
  'rotations/[id].patch': ['coordinator'],
  'rotations/[id].delete': ['coordinator'],
  'rotations/[id]/review.post': ['safety'],
  'shifts/check.post': ['coordinator'],
  'import/shifts/template.get': ['coordinator'],
  'import/shifts/preview.post': ['coordinator'],
  'import/shifts/index.post': ['coordinator'],
  'import/people/template.get': ['coordinator'],
  'import/people/preview.post': ['coordinator'],
  'import/people/index.post': ['coordinator'],
  'sites/[id]/year.get': ALL,
  'sites/[id]/runup.get': ALL,
  'board.get': ALL,
  'slots/search.post': ['coordinator'],
  'reminders/run.post': ['coordinator'],
  'outbox/index.get': ['coordinator'],
  'outbox/[id].get': ['coordinator'],
  'outbox/retry.post': ['coordinator'],
  'invitations/index.get': ['coordinator'],
  'invitations/index.post': ['coordinator'],
  // public: the invitation token in the body is the credential (welcome page, before any account is active)
  'invitations/lookup.post': 'public',
  'auth/invitation.post': 'public',
  'me/feed.get': ALL,
  'me/feed/regenerate.post': ALL,
  'me/preferences.get': ALL,
  'me/preferences.patch': ALL,
  'me/today.get': ALL
}

const API_DIR = resolve(import.meta.dirname, '../../server/api')

function listRouteFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    return statSync(full).isDirectory() ? listRouteFiles(full) : [relative(API_DIR, full).replace(/\.ts$/, '')]
  })
}

function toRequest(file: string) {
  const method = file.split('.').pop()!.toUpperCase()
  const path = '/api/' + file.replace(/\.[a-z]+$/, '').replace(/(^|\/)index$/, '').replace(/\[[^\]]+\]/g, '1')
  return { method, path: path.replace(/\/$/, '') }
}

let server: AppServer
const clients: Partial<Record<Role, ApiClient>> = {}

beforeAll(async () => {
  server = await startAppServer()
  clients.coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  clients.safety = await signedInClient(server, 'safety@gloamline.test')
  clients.crew = await signedInClient(server, 'crew@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

describe('access to every route', () => {
  const files = listRouteFiles(API_DIR)

  it('knows every route file under server/api', () => {
    const unknown = files.filter(f => !(f in ACCESS))
    expect(unknown, 'add these routes to ACCESS with the roles that may call them').toEqual([])
    expect(files.every(f => /\.(get|post|patch|put|delete)$/.test(f)), 'every route file names its method').toBe(true)
  })

  for (const file of files) {
    const { method, path } = toRequest(file)
    const allowed = ACCESS[file]
    if (allowed === 'public' || allowed === undefined) continue
    it(`${method} ${path}: 401 signed out, 403 for roles outside ${allowed.join('/')}`, async () => {
      const anonymous = await new ApiClient(server.url).request(method, path, method === 'GET' ? undefined : {})
      expect(anonymous.status).toBe(401)
      for (const role of ALL) {
        const reply = await clients[role]!.request(method, path, method === 'GET' ? undefined : {})
        if (allowed.includes(role)) expect([401, 403], `${role} should be let in`).not.toContain(reply.status)
        else expect(reply.status, `${role} should be refused`).toBe(403)
        expect(reply.status, `${role} must never see a server error`).toBeLessThan(500)
      }
    })
  }
})

// Each allowed role succeeds (2xx) on each route with a request from access-recipes.ts; a route in
// ACCESS without a recipe fails here, as a route file missing from ACCESS fails above. Run after the
// refusals (a recipe changes data: a new password, archived sites, cancelled shifts).
describe('each allowed role succeeds on every route', () => {
  let kit: RecipeKit
  let counter = 0
  beforeAll(async () => {
    const coordinator = clients.coordinator!
    const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
    const idOf = (email: string) => people.find(p => p.email === email)!.id
    const target = await coordinator.post('/api/people', { name: 'Access Target', email: 'access.target@northwake.test', role: 'crew' })
    // 60° N on the prime meridian, zone UTC: 23:00–01:00 UTC is below civil light every night
    const site = await coordinator.post('/api/sites', { name: 'Invented Access Site', latitude: 60, longitude: 0, timezone: 'UTC' })
    kit = {
      server,
      clients: clients as RecipeKit['clients'],
      ids: { crew: idOf('crew@gloamline.test'), safety: idOf('safety@gloamline.test'), coordinator: idOf('coordinator@gloamline.test'), target: target.body.person?.id ?? target.body.id, siteId: site.body.id },
      uniq: () => `${++counter}`
    }
  })

  it('has a recipe for every route with roles', () => {
    const missing = Object.entries(ACCESS).filter(([file, roles]) => roles !== 'public' && !(file in RECIPES)).map(([file]) => file)
    expect(missing, 'add a request each allowed role succeeds with to access-recipes.ts').toEqual([])
  })

  for (const [file, allowed] of Object.entries(ACCESS)) {
    if (allowed === 'public' || !RECIPES[file]) continue
    const { method } = toRequest(file)
    it(`${method} ${file}: ${allowed.join(', ')} each get a 2xx`, async () => {
      for (const role of allowed) {
        const request = await RECIPES[file]!(role, kit)
        const query = request.query ? `?${new URLSearchParams(request.query)}` : ''
        const reply = await clients[role]!.request(method, `${request.path}${query}`, method === 'GET' ? undefined : (request.body ?? {}))
        expect(reply.status, `${role}: ${JSON.stringify(reply.body).slice(0, 300)}`).toBeGreaterThanOrEqual(200)
        expect(reply.status, `${role}: ${JSON.stringify(reply.body).slice(0, 300)}`).toBeLessThan(300)
      }
    })
  }
})

describe('what a crew member may read', () => {
  it('lists only their own shifts, and answers 404 for anyone else\'s', async () => {
    const mine = await clients.crew!.get('/api/shifts')
    const me = (await clients.crew!.get('/api/auth/me')).body.user
    expect(mine.body.length).toBeGreaterThan(0)
    expect(mine.body.every((s: { assigneeIds: number[] }) => s.assigneeIds.includes(me.id))).toBe(true)
    const all = (await clients.coordinator!.get('/api/shifts')).body as { id: number, assigneeIds: number[] }[]
    const other = all.find(s => !s.assigneeIds.includes(me.id))!
    expect((await clients.crew!.get(`/api/shifts/${other.id}`)).status).toBe(404)
    expect((await clients.crew!.get(`/api/shifts/${mine.body[0].id}`)).status).toBe(200)
    expect((await clients.crew!.get('/api/shifts/999999')).status).toBe(404)
  })
})

describe('security headers', () => {
  it('sends a content-security policy, frame-ancestors none, no-sniff and a referrer policy on pages and API replies', async () => {
    for (const path of ['/login', '/api/auth/me', '/health', '/api/sites']) {
      const res = await fetch(`${server.url}${path}`, path === '/api/sites' ? { headers: { cookie: clients.crew!.cookie } } : {})
      expect(res.headers.get('content-security-policy'), path).toMatch(/frame-ancestors 'none'/)
      // error replies (the signed-out 401) carry the server's stricter script-src 'none' policy instead
      if (res.ok) expect(res.headers.get('content-security-policy'), path).toMatch(/default-src 'self'/)
      expect(res.headers.get('x-content-type-options'), path).toBe('nosniff')
      expect(['same-origin', 'no-referrer'], path).toContain(res.headers.get('referrer-policy'))
    }
  })
})
