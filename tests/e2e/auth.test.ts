import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'

let server: AppServer

beforeAll(async () => {
  server = await startAppServer()
})
afterAll(async () => {
  await server?.stop()
})

describe('sign-in', () => {
  it('signs in each demo account and returns its role', async () => {
    for (const [email, role] of [['coordinator@gloamline.test', 'coordinator'], ['safety@gloamline.test', 'safety'], ['crew@gloamline.test', 'crew']]) {
      const client = new ApiClient(server.url)
      const reply = await client.signIn(email!)
      expect(reply.body.user).toMatchObject({ email, role })
      expect(typeof reply.body.user.id).toBe('number')
      const me = await client.get('/api/auth/me')
      expect(me.body.user.email).toBe(email)
    }
  })

  it('sets an httpOnly, SameSite=Lax session cookie', async () => {
    const res = await fetch(`${server.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'crew@gloamline.test', password: 'gloamline-demo' })
    })
    const cookie = res.headers.getSetCookie().join('\n')
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
  })

  it('answers an unknown e-mail and a wrong password with the same 401 message', async () => {
    const client = new ApiClient(server.url)
    const unknown = await client.post('/api/auth/login', { email: 'nobody@gloamline.test', password: 'whatever-it-is' })
    const wrong = await client.post('/api/auth/login', { email: 'safety@gloamline.test', password: 'not-the-password' })
    expect(unknown.status).toBe(401)
    expect(wrong.status).toBe(401)
    expect(unknown.body.message).toBe(wrong.body.message)
  })

  it('answers 429 with a wait after 5 failed attempts for one e-mail, and not for another', async () => {
    const client = new ApiClient(server.url)
    const email = 'liv.aasen@gloamline.test'
    for (let i = 0; i < 5; i++) {
      expect((await client.post('/api/auth/login', { email, password: `wrong-${i}` })).status).toBe(401)
    }
    const blocked = await client.post('/api/auth/login', { email, password: 'gloamline-demo' })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
    expect((await client.post('/api/auth/login', { email: 'kalle.niemi@gloamline.test', password: 'gloamline-demo' })).status).toBe(200)
  })

  it('signs out: the session no longer works', async () => {
    const client = await signedInClient(server, 'coordinator@gloamline.test')
    expect((await client.get('/api/people')).status).toBe(200)
    await client.post('/api/auth/logout')
    expect((await client.get('/api/people')).status).toBe(401)
  })

  it('answers 400 naming the field for a bad body, and for a body that is not JSON', async () => {
    const client = new ApiClient(server.url)
    const bad = await client.post('/api/auth/login', { email: 'not-an-email', password: 'x' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/email/)
    const notJson = await client.request('POST', '/api/auth/login', undefined, '{"email": ')
    expect(notJson.status).toBe(400)
    expect(JSON.stringify(notJson.body)).not.toMatch(/at .*\.mjs/)
  })
})

describe('people management', () => {
  it('lets a coordinator add a person, change the role and deactivate them; a deactivated person cannot sign in', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const created = await coordinator.post('/api/people', { name: 'Runa Test', email: 'Runa.Test@Gloamline.test', role: 'crew' })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ name: 'Runa Test', email: 'runa.test@gloamline.test', role: 'crew' })
    const id = created.body.id
    const dup = await coordinator.post('/api/people', { name: 'Again', email: 'runa.test@gloamline.test', role: 'crew' })
    expect(dup.status).toBe(409)
    const promoted = await coordinator.patch(`/api/people/${id}`, { role: 'safety' })
    expect(promoted.body.role).toBe('safety')
    const list = await coordinator.get('/api/people')
    expect(list.body.find((p: { id: number }) => p.id === id)).toMatchObject({ role: 'safety' })
    expect(Object.keys(list.body[0]).sort()).toEqual(expect.arrayContaining(['id', 'name', 'email', 'role']))

    // a person with a session is cut off when deactivated
    const crew = await signedInClient(server, 'jonas.eide@gloamline.test')
    const jonas = list.body.find((p: { email: string }) => p.email === 'jonas.eide@gloamline.test')
    expect((await coordinator.patch(`/api/people/${jonas.id}`, { active: false })).body.active).toBe(false)
    expect((await crew.get('/api/people')).status).toBe(401)
    expect((await new ApiClient(server.url).post('/api/auth/login', { email: 'jonas.eide@gloamline.test', password: 'gloamline-demo' })).status).toBe(401)
  })

  it('refuses people management to crew and safety (403) and to the signed-out (401)', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    const safety = await signedInClient(server, 'safety@gloamline.test')
    expect((await crew.post('/api/people', { name: 'X', email: 'x@gloamline.test', role: 'crew' })).status).toBe(403)
    expect((await safety.patch('/api/people/1', { role: 'crew' })).status).toBe(403)
    expect((await crew.get('/api/people')).status).toBe(200)
    expect((await new ApiClient(server.url).get('/api/people')).status).toBe(401)
  })

  it('answers 400 naming the field for a bad role or e-mail', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const badRole = await coordinator.post('/api/people', { name: 'X', email: 'x2@gloamline.test', role: 'admin' })
    expect(badRole.status).toBe(400)
    expect(badRole.body.message).toMatch(/role/)
    const badEmail = await coordinator.post('/api/people', { name: 'X', email: 'x2', role: 'crew' })
    expect(badEmail.status).toBe(400)
    expect(badEmail.body.message).toMatch(/email/)
  })
})
