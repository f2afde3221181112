import { afterEach, describe, expect, it } from 'vitest'
import Database from 'better-sqlite3'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'

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

  it('leaves the database as it was when the server is killed during a large import', async () => {
    const server = await startAppServer({ env: { REQUEST_LOG: 'off' } })
    running.push(server)
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const before = countRows(server.databasePath, 'shifts')
    const rows = Array.from({ length: 6000 }, (_, i) => `Kvitfjell Ice Camp,Killed import ${i},2027-02-0${1 + (i % 8)} 10:00,2027-02-0${1 + (i % 8)} 11:00,any,,`)
    const csv = ['site,title,start,end,light,assignees,notes', ...rows].join('\n')
    const pending = coordinator.post('/api/import/shifts', { csv }).catch(() => null)
    // kill it while the request is being worked on, before any reply
    await new Promise(r => setTimeout(r, 400))
    server.process.kill('SIGKILL')
    await pending
    if (server.process.exitCode === null && server.process.signalCode === null) await new Promise(r => server.process.once('exit', r))
    const after = countRows(server.databasePath, 'shifts')
    // all or nothing: never part of the file
    expect([before, before + rows.length]).toContain(after)
    const restarted = await startAppServer({ databasePath: server.databasePath, env: { REQUEST_LOG: 'off' } })
    running.push(restarted)
    const again = await signedInClient(restarted, 'coordinator@gloamline.test')
    expect((await again.get('/api/sites')).status).toBe(200)
  }, 60_000)
})

describe('a read-only database file', () => {
  it('serves reads and answers every write with 503 and a message', async () => {
    const first = await startAppServer({ env: { REQUEST_LOG: 'off' } })
    running.push(first)
    const signedIn = await signedInClient(first, 'coordinator@gloamline.test')
    first.process.kill('SIGTERM')
    await new Promise(r => first.process.once('exit', r))
    const readOnly = await startAppServer({ databasePath: first.databasePath, env: { REQUEST_LOG: 'off', DATABASE_READ_ONLY: '1' } })
    running.push(readOnly)
    const client = await signedInClient(readOnly, 'coordinator@gloamline.test')
    expect(signedIn.cookie).not.toBe('')
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
