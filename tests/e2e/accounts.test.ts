// Accounts end to end, over HTTP against the built server: a way in for every person (set-password
// links on add and import, re-send, reset, forgot), sessions that end on the server, writes only from
// our own pages, bodies capped before they are read, privacy of colleagues' data, and the request log.
// Mail goes through a real SMTP sink (scripts/mail-sink.mjs). The sign-in limiter has its own file.
import Database from 'better-sqlite3'
import { createHash } from 'node:crypto'
import { request as httpRequest } from 'node:http'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { ApiClient, DEMO_PASSWORD, signedInClient, startAppServer, type AppServer } from '../support/app-server'

interface SinkMessage { to: string[], subject: string, text: string, html: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let server: AppServer
let coordinator: ApiClient
const NEW_PASSWORD = 'fjord-lantern-basalt-73'

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  server = await startAppServer({ env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off' } })
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
  await sink?.close()
})

async function waitForMail(email: string, path: 'welcome' | 'reset', count = 1): Promise<string> {
  const pattern = new RegExp(`(http://[^\\s]+/${path}\\?token=[A-Za-z0-9_%-]+)`)
  for (let i = 0; i < 100; i++) {
    const mails = sink.messages.filter(m => m.to.includes(email) && pattern.test(m.text))
    if (mails.length >= count) return pattern.exec(mails[mails.length - 1]!.text)![1]!
    await new Promise(r => setTimeout(r, 50))
  }
  throw new Error(`no ${path} link for ${email}`)
}

function tokenOf(link: string) {
  return decodeURIComponent(new URL(link).searchParams.get('token')!)
}

function readDb<T>(sql: string, ...params: unknown[]): T {
  const db = new Database(server.databasePath, { readonly: true })
  try {
    return db.prepare(sql).get(...params) as T
  } finally {
    db.close()
  }
}

async function personId(email: string): Promise<number> {
  const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
  return people.find(p => p.email === email)!.id
}

describe('a way in for every person', () => {
  it('mails a person added by form a link to choose a password, shows them as pending, and the link signs them in', async () => {
    const email = 'brede.holm@northwake.test'
    const added = await coordinator.post('/api/people', { name: 'Brede Holm', email, role: 'crew' })
    expect(added.status).toBe(201)
    expect(added.body.mail.status).toBe('sent')
    const listed = (await coordinator.get('/api/people')).body.find((p: { email: string }) => p.email === email)
    expect(listed).toMatchObject({ pending: true, active: true })
    const link = await waitForMail(email, 'welcome')
    const visitor = new ApiClient(server.url)
    expect((await visitor.post('/api/invitations/lookup', { token: tokenOf(link) })).body).toMatchObject({ name: 'Brede Holm', email })
    const accepted = await visitor.post('/api/auth/invitation', { token: tokenOf(link), password: NEW_PASSWORD })
    expect(accepted.status).toBe(200)
    expect((await visitor.get('/api/auth/me')).body.user.email).toBe(email)
    expect((await coordinator.get('/api/people')).body.find((p: { email: string }) => p.email === email).pending).toBe(false)
  })

  it('mails everyone added by a CSV import a link to choose a password', async () => {
    const csv = ['name,email,role,crews', 'Tove Aas,tove.aas@northwake.test,crew,', 'Nils Berg,nils.berg@northwake.test,safety,'].join('\n')
    const reply = await coordinator.post('/api/import/people', { csv })
    expect(reply.status).toBe(201)
    expect(reply.body).toMatchObject({ created: 2, invited: 2 })
    const link = await waitForMail('nils.berg@northwake.test', 'welcome')
    await waitForMail('tove.aas@northwake.test', 'welcome')
    const visitor = new ApiClient(server.url)
    expect((await visitor.post('/api/auth/invitation', { token: tokenOf(link), password: NEW_PASSWORD })).body.user.role).toBe('safety')
  })

  it('lets a coordinator re-send the link of a pending person (the earlier link stops working) and send an active one a reset', async () => {
    const email = 'eira.dahl@northwake.test'
    await coordinator.post('/api/people', { name: 'Eira Dahl', email, role: 'crew' })
    const first = tokenOf(await waitForMail(email, 'welcome'))
    const id = await personId(email)
    const again = await coordinator.post(`/api/people/${id}/password-link`, {})
    expect(again.status).toBe(201)
    expect(again.body.purpose).toBe('invitation')
    const second = tokenOf(await waitForMail(email, 'welcome', 2))
    expect(second).not.toBe(first)
    expect((await new ApiClient(server.url).post('/api/auth/invitation', { token: first, password: NEW_PASSWORD })).status).toBe(410)
    expect((await new ApiClient(server.url).post('/api/auth/invitation', { token: second, password: NEW_PASSWORD })).status).toBe(200)

    const reset = await coordinator.post(`/api/people/${id}/password-link`, {})
    expect(reset.body.purpose).toBe('reset')
    const resetToken = tokenOf(await waitForMail(email, 'reset'))
    expect((await new ApiClient(server.url).post('/api/auth/reset', { token: resetToken, password: 'tundra-ember-quill-58' })).status).toBe(200)
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: 'tundra-ember-quill-58' })).status).toBe(200)
  })

  it('answers "forgot" the same for a known and an unknown address, and mails only the known one a one-hour link stored as a hash', async () => {
    const email = 'liv.aasen@gloamline.test'
    const known = await new ApiClient(server.url).post('/api/auth/forgot', { email })
    const unknown = await new ApiClient(server.url).post('/api/auth/forgot', { email: 'nobody.here@northwake.test' })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(unknown.body).toEqual(known.body)
    const link = await waitForMail(email, 'reset')
    const token = tokenOf(link)
    expect(sink.messages.some(m => m.to.includes('nobody.here@northwake.test'))).toBe(false)
    const stored = readDb<{ h: string, e: number, c: number, p: string }>(
      'select token_hash as h, expires_at as e, created_at as c, purpose as p from invitations where token_hash = ?', createHash('sha256').update(token).digest('hex'))
    expect(stored.p).toBe('reset')
    expect(stored.e - stored.c).toBe(3_600_000)
    const raw = readDb<{ n: number }>('select count(*) as n from invitations where token_hash = ?', token)
    expect(raw.n).toBe(0)
  })

  it('sets a new password through a reset link once; the old password and every other session stop working', async () => {
    const email = 'kalle.niemi@gloamline.test'
    const elsewhere = await signedInClient(server, email)
    expect((await elsewhere.get('/api/auth/me')).status).toBe(200)
    await new ApiClient(server.url).post('/api/auth/forgot', { email })
    const token = tokenOf(await waitForMail(email, 'reset'))
    const browser = new ApiClient(server.url)
    const weak = await browser.post('/api/auth/reset', { token, password: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.data.issues[0].field).toBe('password')
    const done = await browser.post('/api/auth/reset', { token, password: NEW_PASSWORD })
    expect(done.status).toBe(200)
    expect((await browser.get('/api/auth/me')).body.user.email).toBe(email)
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401)
    expect((await new ApiClient(server.url).post('/api/auth/reset', { token, password: 'another-pass-phrase-9' })).status).toBe(410)
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: DEMO_PASSWORD })).status).toBe(401)
    expect((await new ApiClient(server.url).post('/api/auth/login', { email, password: NEW_PASSWORD })).status).toBe(200)
  })

  it('refuses an expired reset link with a clear message', async () => {
    const email = 'safety@gloamline.test'
    await new ApiClient(server.url).post('/api/auth/forgot', { email })
    const token = tokenOf(await waitForMail(email, 'reset'))
    const db = new Database(server.databasePath)
    // the server's clock may not be the wall clock: expire the link at the instant it was made
    db.prepare('update invitations set expires_at = created_at where token_hash = ?').run(createHash('sha256').update(token).digest('hex'))
    db.close()
    const reply = await new ApiClient(server.url).post('/api/auth/reset', { token, password: NEW_PASSWORD })
    expect(reply.status).toBe(410)
    expect(reply.body.message).toMatch(/expired/)
  })
})

describe('sessions that can be ended', () => {
  it('refuses a copied cookie after sign-out', async () => {
    const owner = await signedInClient(server, 'crew@gloamline.test')
    const thief = new ApiClient(server.url)
    thief.cookie = owner.cookie
    expect((await thief.get('/api/me/today')).status).toBe(200)
    expect((await owner.post('/api/auth/logout')).status).toBe(200)
    expect((await thief.get('/api/me/today')).status).toBe(401)
    expect((await thief.get('/api/auth/me')).status).toBe(401)
  })

  it('ends every session of a deactivated person, and they stay ended after reactivation', async () => {
    const email = 'jonas.eide@gloamline.test'
    const crew = await signedInClient(server, email)
    const copy = crew.cookie
    const id = await personId(email)
    expect((await coordinator.patch(`/api/people/${id}`, { active: false })).status).toBe(200)
    expect((await coordinator.patch(`/api/people/${id}`, { active: true })).status).toBe(200)
    const stale = new ApiClient(server.url)
    stale.cookie = copy
    expect((await stale.get('/api/auth/me')).status).toBe(401)
    expect((await signedInClient(server, email)).cookie).not.toBe('')
  })

  it('changes the password when signed in: other sessions end, this one goes on', async () => {
    const email = 'ada.lind@northwake.test'
    await coordinator.post('/api/people', { name: 'Ada Lind', email, role: 'crew' })
    const first = new ApiClient(server.url)
    await first.post('/api/auth/invitation', { token: tokenOf(await waitForMail(email, 'welcome')), password: NEW_PASSWORD })
    const second = await signedInClient(server, email, NEW_PASSWORD)
    expect((await second.get('/api/auth/sessions')).body.live).toBe(2)
    const wrong = await first.post('/api/auth/password', { currentPassword: 'not-it-at-all', newPassword: 'glacier-pine-ochre-11' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.data.issues[0].field).toBe('currentPassword')
    const changed = await first.post('/api/auth/password', { currentPassword: NEW_PASSWORD, newPassword: 'glacier-pine-ochre-11' })
    expect(changed.status).toBe(200)
    expect((await first.get('/api/auth/me')).status).toBe(200)
    expect((await second.get('/api/auth/me')).status).toBe(401)
  })

  it('signs out everywhere else from settings, keeping this browser', async () => {
    const email = 'dev.raman@gloamline.test'
    const here = await signedInClient(server, email)
    const phone = await signedInClient(server, email)
    const ended = await here.post('/api/auth/logout-others', {})
    expect(ended.status).toBe(200)
    expect(ended.body.ended).toBeGreaterThanOrEqual(1)
    expect((await phone.get('/api/auth/me')).status).toBe(401)
    expect((await here.get('/api/auth/me')).status).toBe(200)
  })

  it('shows an ended session as signed out on the page\'s session check too', async () => {
    const owner = await signedInClient(server, 'crew@gloamline.test')
    const copy = new ApiClient(server.url)
    copy.cookie = owner.cookie
    await owner.post('/api/auth/logout')
    const check = await copy.get('/api/_auth/session')
    expect(check.body?.user).toBeUndefined()
  })
})

describe('writes only from our own pages', () => {
  async function rawPost(path: string, headers: Record<string, string>, body: string) {
    const res = await fetch(`${server.url}${path}`, { method: 'POST', headers: { cookie: coordinator.cookie, ...headers }, body })
    return res.status
  }
  const site = JSON.stringify({ name: 'Forged site', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })

  it('refuses a form-encoded or plain-text write with 415, even with a valid session', async () => {
    expect(await rawPost('/api/sites', { 'content-type': 'application/x-www-form-urlencoded' }, 'name=Forged&latitude=70&longitude=20&timezone=Europe%2FOslo')).toBe(415)
    expect(await rawPost('/api/sites', { 'content-type': 'text/plain' }, site)).toBe(415)
    expect(await rawPost('/api/invitations', { 'content-type': 'multipart/form-data; boundary=x' }, '--x--')).toBe(415)
  })

  it('refuses a write whose Origin is another site, or another port of this host, with 403', async () => {
    const otherPort = server.url.replace(/:(\d+)$/, (_m, p) => `:${Number(p) + 1}`)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'origin': 'http://evil.test' }, site)).toBe(403)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'origin': otherPort }, site)).toBe(403)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'origin': 'null' }, site)).toBe(403)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'sec-fetch-site': 'same-site' }, site)).toBe(403)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'sec-fetch-site': 'cross-site' }, site)).toBe(403)
    const sites = (await coordinator.get('/api/sites')).body as { name: string }[]
    expect(sites.some(s => s.name === 'Forged site')).toBe(false)
  })

  it('accepts a JSON write from our own origin, and one with neither header on its session alone', async () => {
    expect(await rawPost('/api/sites', { 'content-type': 'application/json', 'origin': server.url, 'sec-fetch-site': 'same-origin' }, JSON.stringify({ name: 'Own page site', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' }))).toBe(201)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json; charset=utf-8' }, JSON.stringify({ name: 'Script site', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' }))).toBe(201)
    expect(await rawPost('/api/sites', { 'content-type': 'application/json' }, JSON.stringify({ name: 'x', latitude: 70 }))).toBe(400)
  })
})

// Streams `totalBytes` of JSON-ish filler to a route (with or without a Content-Length) and resolves
// with the status as soon as the server answers, stopping the upload there.
function streamBody(path: string, totalBytes: number, options: { declareLength: boolean, cookie?: string }): Promise<number> {
  const url = new URL(path, server.url)
  return new Promise((resolve, reject) => {
    const headers: Record<string, string | number> = { 'content-type': 'application/json' }
    if (options.declareLength) headers['content-length'] = totalBytes
    if (options.cookie) headers.cookie = options.cookie
    const req = httpRequest({ hostname: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers })
    let answered = false
    req.on('response', (res) => {
      answered = true
      resolve(res.statusCode!)
      res.resume()
      req.destroy()
    })
    req.on('error', err => (answered ? undefined : reject(err)))
    const chunk = Buffer.alloc(256 * 1024, 'a')
    let sent = 0
    const pump = () => {
      while (!answered && sent < totalBytes) {
        sent += chunk.length
        if (!req.write(chunk)) return void req.once('drain', pump)
      }
      if (!answered) req.end()
    }
    req.write('{"email":"')
    pump()
  })
}

function serverRssMb(): number {
  const status = readFileSync(`/proc/${server.process.pid}/status`, 'utf8')
  return Number(/VmRSS:\s+(\d+) kB/.exec(status)![1]) / 1024
}

describe('bodies capped before they are read whole', () => {
  it('answers four anonymous 150 MB sign-in bodies with 413 and keeps the server\'s memory and /health', async () => {
    const before = serverRssMb()
    const statuses = await Promise.all([0, 1, 2, 3].map(i => streamBody('/api/auth/login', 150 * 1024 * 1024, { declareLength: i % 2 === 0 })))
    expect(statuses).toEqual([413, 413, 413, 413])
    const health = await fetch(`${server.url}/health`)
    expect(health.status).toBe(200)
    // each body is refused after at most 1 MB: growth stays far below the 4 × 150 MB sent
    expect(serverRssMb() - before).toBeLessThan(100)
  })

  it('refuses a 2 MB JSON body to an ordinary route with 413', async () => {
    expect(await streamBody('/api/sites', 2 * 1024 * 1024, { declareLength: false, cookie: coordinator.cookie })).toBe(413)
  })

  it('allows the larger import limit only after the coordinator check', async () => {
    expect(await streamBody('/api/import/people/preview', 3 * 1024 * 1024, { declareLength: true })).toBe(401)
    const crew = await signedInClient(server, 'crew@gloamline.test')
    expect(await streamBody('/api/import/people/preview', 3 * 1024 * 1024, { declareLength: true, cookie: crew.cookie })).toBe(403)
    // 9,000 rows (under the 10,000-row import limit) of about 120 bytes: over 1 MB of JSON
    const csv = ['name,email,role,crews', ...Array.from({ length: 9_000 }, (_, i) => `Filler Person Number ${i} of the Long Winter Survey Party at the Northern Camp,filler.person.number.${i}@northwake.test,crew,`)].join('\n')
    expect(csv.length).toBeGreaterThan(1_000_000)
    const big = await coordinator.post('/api/import/people/preview', { csv })
    expect(big.status).toBe(200)
    expect(big.body.valid).toBe(true)
  })
})

describe('privacy', () => {
  it('shows crew their colleagues\' names but not their e-mail addresses', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    const me = (await crew.get('/api/auth/me')).body.user
    const people = (await crew.get('/api/people')).body as { id: number, name: string, email: string | null }[]
    expect(people.length).toBeGreaterThan(3)
    expect(people.find(p => p.id === me.id)!.email).toBe('crew@gloamline.test')
    const others = people.filter(p => p.id !== me.id)
    expect(others.every(p => p.name && p.email === null)).toBe(true)
    expect(JSON.stringify(others)).not.toMatch(/@/)
    expect((await crew.get(`/api/people/${others[0]!.id}`)).body.email).toBeNull()
    expect((await coordinator.get(`/api/people/${others[0]!.id}`)).body.email).toMatch(/@/)
  })

  it('does not show crew why a colleague is away', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    const me = (await crew.get('/api/auth/me')).body.user
    const other = await personId('liv.aasen@gloamline.test')
    const made = await coordinator.post('/api/unavailability', { personId: other, start: '2027-02-01', end: '2027-02-03', reason: 'Medical appointment in Tromsø' })
    expect(made.status).toBe(201)
    const own = await coordinator.post('/api/unavailability', { personId: me.id, start: '2027-02-05', end: '2027-02-06', reason: 'Own travel day' })
    expect(own.status).toBe(201)
    const seen = (await crew.get('/api/unavailability?from=2027-01-30&to=2027-02-10')).body as { personId: number, reason: string }[]
    expect(seen.find(s => s.personId === other)!.reason).toBe('')
    expect(seen.find(s => s.personId === me.id)!.reason).toBe('Own travel day')
    const asCoordinator = (await coordinator.get('/api/unavailability?from=2027-01-30&to=2027-02-10')).body as { personId: number, reason: string }[]
    expect(asCoordinator.find(s => s.personId === other)!.reason).toBe('Medical appointment in Tromsø')
  })

  it('keeps invitation and reset links out of the stored outbox body; only the sent mail carries them', async () => {
    const email = 'ruth.solberg@northwake.test'
    const invited = await coordinator.post('/api/invitations', { name: 'Ruth Solberg', email, role: 'coordinator' })
    const token = tokenOf(await waitForMail(email, 'welcome'))
    const stored = await coordinator.get(`/api/outbox/${invited.body.mail.messageId}`)
    expect(stored.status).toBe(200)
    const everything = JSON.stringify(stored.body)
    expect(everything).not.toContain(token)
    expect(everything).not.toContain(encodeURIComponent(token))
    expect(everything).not.toMatch(/welcome\?token=/)
    const row = readDb<{ html: string, text: string, meta: string }>('select html, text, meta from messages where id = ?', invited.body.mail.messageId)
    expect(`${row.html}${row.text}${row.meta}`).not.toContain(token)
  })

  it('refuses control characters in names and titles, naming the field', async () => {
    const person = await coordinator.post('/api/people', { name: 'Eve\r\nEND:VCALENDAR', email: 'eve.x@northwake.test', role: 'crew' })
    expect(person.status).toBe(400)
    expect(person.body.message).toMatch(/name/)
    const id = await personId('crew@gloamline.test')
    expect((await coordinator.patch(`/api/people/${id}`, { name: 'Aputsiaq\u0007' })).status).toBe(400)
    const site = await coordinator.post('/api/sites', { name: 'Camp\nTwo', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })
    expect(site.status).toBe(400)
    expect(site.body.message).toMatch(/name/)
    const crew = await coordinator.post('/api/crews', { name: 'Night\u2028crew', memberIds: [] })
    expect(crew.status).toBe(400)
    const sites = (await coordinator.get('/api/sites')).body as { id: number }[]
    const shift = await coordinator.post('/api/shifts', { siteId: sites[0]!.id, title: 'Survey\r\nBEGIN:VEVENT', start: '2027-03-02T09:00', end: '2027-03-02T12:00', light: 'any', assigneeIds: [] })
    expect(shift.status).toBe(400)
    expect(shift.body.message).toMatch(/title/)
  })

  it('escapes a line break in a stored name in the calendar feed (RFC 5545 3.3.11 TEXT escaping)', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    const me = (await crew.get('/api/auth/me')).body.user
    const feed = (await crew.get('/api/me/feed')).body as { url: string }
    const db = new Database(server.databasePath)
    db.prepare('update people set name = ? where id = ?').run('Aputsiaq\r\nEND:VCALENDAR\r\nBEGIN:VEVENT\r\nSUMMARY:Forged', me.id)
    db.close()
    const text = await (await fetch(feed.url.replace(/^https?:\/\/[^/]+/, server.url))).text()
    const lines = text.split('\r\n')
    expect(lines.filter(l => l === 'END:VCALENDAR')).toHaveLength(1)
    expect(lines.some(l => l.startsWith('SUMMARY:Forged'))).toBe(false)
    expect(text).toContain('Aputsiaq\\nEND:VCALENDAR')
  })
})

describe('logs and caching', () => {
  it('logs refused and failed requests with their status, and never a token', async () => {
    await new ApiClient(server.url).get('/api/people')
    const token = 'Q'.repeat(43)
    await fetch(`${server.url}/feed/${token}.ics`)
    await fetch(`${server.url}/api/sites`, { method: 'POST', headers: { 'content-type': 'text/plain', 'cookie': coordinator.cookie }, body: 'x' })
    await new Promise(r => setTimeout(r, 100))
    const lines = server.output().split('\n').filter(l => l.startsWith('{')).map(l => JSON.parse(l) as { path: string, status: number, method: string })
    expect(lines).toContainEqual(expect.objectContaining({ method: 'GET', path: '/api/people', status: 401 }))
    expect(lines).toContainEqual(expect.objectContaining({ method: 'POST', path: '/api/sites', status: 415 }))
    expect(lines).toContainEqual(expect.objectContaining({ path: '/feed/…', status: 404 }))
    expect(server.output()).not.toContain(token)
  })

  it('marks personal API replies and pages no-store, and sends HSTS only over HTTPS', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    for (const path of ['/api/auth/me', '/api/me/today', '/api/people']) {
      const res = await fetch(`${server.url}${path}`, { headers: { cookie: crew.cookie } })
      expect(res.headers.get('cache-control'), path).toBe('no-store')
    }
    const page = await fetch(`${server.url}/settings`, { headers: { cookie: crew.cookie } })
    expect(page.headers.get('cache-control')).toBe('no-store')
    expect(page.headers.get('strict-transport-security')).toBeNull()
    const proxied = await fetch(`${server.url}/login`, { headers: { 'x-forwarded-proto': 'https' } })
    expect(proxied.headers.get('strict-transport-security')).toMatch(/max-age=\d{7,}/)
  })
})
