// Invitations end to end: the coordinator invites with a role, the mail (through a real SMTP sink)
// carries a one-time link, the link sets a password and signs in once, and it expires after 72 h
// (the clock is faked by moving expiresAt back in the database).
import Database from 'better-sqlite3'
import { createHash } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'

interface SinkMessage { to: string[], subject: string, text: string, html: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let server: AppServer
let coordinator: ApiClient
const PASSWORD = 'lichen-sledge-aurora-42'

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  server = await startAppServer({ env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
  await sink?.close()
})

function linkIn(email: string): string {
  const message = [...sink.messages].reverse().find(m => m.to.includes(email))
  const match = /(http:\/\/[^\s]+\/welcome\?token=[A-Za-z0-9_%-]+)/.exec(message?.text ?? '')
  if (!match) throw new Error(`no invitation link for ${email}`)
  return match[1]!
}

function tokenOf(link: string) {
  return decodeURIComponent(new URL(link).searchParams.get('token')!)
}

describe('invitations', () => {
  it('invites with the given role; the link sets a password and signs in, once', async () => {
    const email = 'hedda.voll@northwake.test'
    const reply = await coordinator.post('/api/invitations', { name: 'Hedda Voll', email, role: 'safety' })
    expect(reply.status).toBe(201)
    expect(reply.body.person).toMatchObject({ email, role: 'safety', active: false })
    expect(reply.body.mail.status).toBe('sent')
    const link = linkIn(email)
    expect(link.startsWith(server.url)).toBe(true)
    const token = tokenOf(link)
    // only the SHA-256 of the token is stored
    const db = new Database(server.databasePath, { readonly: true })
    const stored = db.prepare('select token_hash as h, expires_at as e, created_at as c from invitations where person_id = ?').get(reply.body.person.id) as { h: string, e: number, c: number }
    db.close()
    expect(stored.h).toBe(createHash('sha256').update(token).digest('hex'))
    expect(stored.h).not.toContain(token)
    expect(stored.e - stored.c).toBeGreaterThanOrEqual(72 * 3_600_000 - 5_000)
    expect(stored.e - stored.c).toBeLessThanOrEqual(72 * 3_600_000 + 5_000)
    // an inactive account cannot sign in yet
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: PASSWORD })).status).toBe(401)

    const visitor = new ApiClient(server.url)
    expect((await visitor.post('/api/invitations/lookup', { token })).body).toMatchObject({ name: 'Hedda Voll', email, role: 'safety' })
    const accepted = await visitor.post('/api/auth/invitation', { token, password: PASSWORD })
    expect(accepted.status).toBe(200)
    expect(accepted.body.user).toMatchObject({ email, role: 'safety' })
    expect((await visitor.get('/api/auth/me')).body.user.role).toBe('safety')
    expect((await visitor.get('/api/review/queue')).status).toBe(200)
    // the password works for a normal sign-in from now on
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: PASSWORD })).status).toBe(200)

    const second = await new ApiClient(server.url).post('/api/auth/invitation', { token, password: 'another-pass-phrase-9' })
    expect(second.status).toBe(410)
    expect(second.body.message).toMatch(/already been used/)
    expect((await new ApiClient(server.url).post('/api/invitations/lookup', { token })).status).toBe(410)
  })

  it('refuses an expired link with a clear message', async () => {
    const email = 'ole.strand@northwake.test'
    const reply = await coordinator.post('/api/invitations', { name: 'Ole Strand', email, role: 'crew' })
    const token = tokenOf(linkIn(email))
    const db = new Database(server.databasePath)
    db.prepare('update invitations set expires_at = ? where person_id = ?').run(server.clock.now() - 1000, reply.body.person.id)
    db.close()
    const expired = await new ApiClient(server.url).post('/api/auth/invitation', { token, password: PASSWORD })
    expect(expired.status).toBe(410)
    expect(expired.body.message).toMatch(/expired/)
    expect(expired.body.data.issues[0].field).toBe('token')
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: PASSWORD })).status).toBe(401)
  })

  it('sends a new link to someone invited before, and the old link stops working', async () => {
    const email = 'mari.lund@northwake.test'
    await coordinator.post('/api/invitations', { name: 'Mari Lund', email, role: 'crew' })
    const first = tokenOf(linkIn(email))
    const again = await coordinator.post('/api/invitations', { name: 'Mari Lund', email, role: 'coordinator' })
    expect(again.status).toBe(201)
    const second = tokenOf(linkIn(email))
    expect(second).not.toBe(first)
    expect((await new ApiClient(server.url).post('/api/auth/invitation', { token: first, password: PASSWORD })).status).toBe(410)
    const ok = await new ApiClient(server.url).post('/api/auth/invitation', { token: second, password: PASSWORD })
    expect(ok.body.user.role).toBe('coordinator')
  })

  it('answers bad input with clear 4xx messages naming the field, and writes nothing', async () => {
    const count = async () => (await coordinator.get('/api/invitations')).body.invitations.length
    const before = await count()
    const notEmail = await coordinator.post('/api/invitations', { name: 'X', email: 'not-an-email', role: 'crew' })
    expect(notEmail.status).toBe(400)
    expect(notEmail.body.message).toMatch(/email/)
    const badRole = await coordinator.post('/api/invitations', { name: 'X', email: 'x@northwake.test', role: 'captain' })
    expect(badRole.status).toBe(400)
    expect(badRole.body.message).toMatch(/role/)
    const active = await coordinator.post('/api/invitations', { name: 'Aputsiaq', email: 'crew@gloamline.test', role: 'crew' })
    expect(active.status).toBe(409)
    expect(active.body.message).toMatch(/already has an active account/)
    expect(await count()).toBe(before)

    const visitor = new ApiClient(server.url)
    const unknown = await visitor.post('/api/auth/invitation', { token: 'no-such-token', password: PASSWORD })
    expect(unknown.status).toBe(400)
    expect(unknown.body.message).toMatch(/not valid/)
    // a weak password is refused before the token is spent
    await coordinator.post('/api/invitations', { name: 'Siri Moe', email: 'siri.moe@northwake.test', role: 'crew' })
    const token = tokenOf(linkIn('siri.moe@northwake.test'))
    const weak = await visitor.post('/api/auth/invitation', { token, password: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.message).toMatch(/password/)
    expect((await visitor.post('/api/auth/invitation', { token, password: PASSWORD })).status).toBe(200)
    const crew = await signedInClient(server, 'crew@gloamline.test')
    expect((await crew.post('/api/invitations', { name: 'X', email: 'y@northwake.test', role: 'crew' })).status).toBe(403)
  })
})
