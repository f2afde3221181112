import { performance } from 'node:perf_hooks'
import { afterEach, describe, expect, it } from 'vitest'
import Database from 'better-sqlite3'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'

const running: AppServer[] = []
afterEach(async () => {
  for (const s of running.splice(0)) await s.stop()
})

function countRows(path: string, table: string) {
  const db = new Database(path, { readonly: true })
  try {
    return (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n
  } finally {
    db.close()
  }
}

describe('faults', () => {
  it('answers 503 with a message, not a crash, while the database cannot be written', async () => {
    const server = await startAppServer({ env: { REQUEST_LOG: 'off' } })
    running.push(server)
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    // another process holds the write lock longer than the server waits for it (busy_timeout 5 s)
    const blocker = new Database(server.databasePath)
    blocker.exec('BEGIN EXCLUSIVE')
    try {
      const reply = await coordinator.post('/api/sites', { name: 'Locked out', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })
      expect(reply.status).toBe(503)
      expect(reply.body.message).toMatch(/cannot be written/)
    } finally {
      blocker.exec('ROLLBACK')
      blocker.close()
    }
    // and the server is still there afterwards
    const after = await coordinator.post('/api/sites', { name: 'After the lock', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })
    expect(after.status).toBe(201)
  }, 30_000)

  it('leaves the database as it was when the server is killed inside the import\'s write transaction', async () => {
    const server = await startAppServer({ env: { REQUEST_LOG: 'off', REMINDER_TIMER: 'off' } })
    running.push(server)
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const before = countRows(server.databasePath, 'shifts')
    const rows = Array.from({ length: 6000 }, (_, i) => `Kvitfjell Ice Camp,Killed import ${i},2027-02-0${1 + (i % 8)} 10:00,2027-02-0${1 + (i % 8)} 11:00,any,,`)
    const csv = ['site,title,start,end,light,assignees,notes', ...rows].join('\n')
    const watcher = new Database(server.databasePath, { timeout: 0 })
    try {
      // nothing holds the write lock before the import starts
      expect(holdsWriteLock(watcher)).toBe(false)
      const pending = coordinator.post('/api/import/shifts', { csv }).catch(() => null)
      // the server is the only writer: once another connection is refused the write lock several
      // times running, the import's transaction is open. Kill it then, before it can commit.
      await waitForWriteLock(watcher, 3)
      await server.kill()
      await pending
    } finally {
      watcher.close()
    }
    // inside the transaction means nothing of the file was committed: not a single row
    expect(countRows(server.databasePath, 'shifts')).toBe(before)
    const restarted = await startAppServer({ databasePath: server.databasePath, env: { REQUEST_LOG: 'off' } })
    running.push(restarted)
    const again = await signedInClient(restarted, 'coordinator@gloamline.test')
    expect((await again.get('/api/sites')).status).toBe(200)
  }, 60_000)
})

// True while another connection holds the database's write lock: BEGIN IMMEDIATE is refused at
// once (busy timeout 0). When it is granted it is rolled back straight away.
function holdsWriteLock(db: Database.Database): boolean {
  try {
    db.exec('BEGIN IMMEDIATE')
  } catch (err) {
    if ((err as { code?: string }).code === 'SQLITE_BUSY') return true
    throw err
  }
  db.exec('ROLLBACK')
  return false
}

async function waitForWriteLock(db: Database.Database, timesRunning: number, ms = 30_000) {
  const deadline = performance.now() + ms
  let seen = 0
  while (seen < timesRunning) {
    if (performance.now() > deadline) throw new Error('the import never held the write lock')
    seen = holdsWriteLock(db) ? seen + 1 : 0
    if (seen < timesRunning) await new Promise(r => setTimeout(r, 5))
  }
}

describe('a read-only database file', () => {
  it('serves reads and answers every write with 503 and a message', async () => {
    const first = await startAppServer({ env: { REQUEST_LOG: 'off' } })
    running.push(first)
    const signedIn = await signedInClient(first, 'coordinator@gloamline.test')
    first.process.kill('SIGTERM')
    await new Promise(r => first.process.once('exit', r))
    const readOnly = await startAppServer({ databasePath: first.databasePath, env: { REQUEST_LOG: 'off', DATABASE_READ_ONLY: '1' } })
    running.push(readOnly)
    // a session started before the maintenance goes on reading; a new sign-in cannot be counted, so it
    // is refused (the sign-in limiter fails closed)
    const client = new ApiClient(readOnly.url)
    client.cookie = signedIn.cookie
    expect(signedIn.cookie).not.toBe('')
    const fresh = await new ApiClient(readOnly.url).post('/api/auth/login', { email: 'coordinator@gloamline.test', password: 'gloamline-demo' })
    expect(fresh.status).toBe(503)
    expect((await client.get('/api/sites')).status).toBe(200)
    const write = await client.post('/api/sites', { name: 'Read-only site', latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })
    expect(write.status).toBe(503)
    expect(write.body.message).toMatch(/cannot be written/)
    const shifts = (await client.get('/api/shifts')).body
    const moved = await client.patch(`/api/shifts/${shifts[0].id}`, { title: 'Renamed while read-only' })
    expect(moved.status).toBe(503)
    expect(countRows(first.databasePath, 'sites')).toBe((await client.get('/api/sites')).body.length)
  }, 60_000)
})
