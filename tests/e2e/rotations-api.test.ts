import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

// The rotation routes on the built server, as docs/api.md ("Rotations") fixes them: made, read, changed
// and cancelled from a date, decided as one; bad input answered 400 naming the field with nothing
// written. The site and people are invented here; dates are far from the seeded demo weeks. Wall
// clock reference: the tz data through Intl (Arctic/Longyearbyen, EU summer time, back 31 Oct 2027).
let server: AppServer
let coordinator: ApiClient
let safety: ApiClient
const ids: Record<string, number> = {}

function countRows(table: string) {
  const db = new Database(server.databasePath, { readonly: true, fileMustExist: true })
  try {
    return (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n
  } finally {
    db.close()
  }
}

function intlWall(iso: string) {
  const p = Object.fromEntries(new Intl.DateTimeFormat('en-CA', { timeZone: 'Arctic/Longyearbyen', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(Date.parse(iso)).map(x => [x.type, x.value]))
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute}`
}

const good = () => ({
  siteId: ids.site, title: 'Tide gauge round', light: 'daylight', from: '2027-10-25', to: '2027-11-14',
  startTime: '10:00', endTime: '14:00', onDays: 4, offDays: 3, assigneeIds: [ids.person]
})

beforeAll(async () => {
  server = await startAppServer()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  safety = await signedInClient(server, 'safety@gloamline.test')
  const site = await coordinator.post('/api/sites', { name: 'Rotation Test Point', latitude: 76.2, longitude: 15.8, timezone: 'Arctic/Longyearbyen' })
  ids.site = site.body.id
  const person = await coordinator.post('/api/people', { name: 'Rota Test', email: 'rota@rotations.gloamline.test', role: 'crew' })
  ids.person = person.body.id
})
afterAll(async () => {
  await server?.stop()
})

describe('rotation routes', () => {
  const bad: [string, Record<string, unknown>, string][] = [
    ['0 working days', { onDays: 0 }, 'onDays'],
    ['negative off days', { offDays: -2 }, 'offDays'],
    ['to before from', { to: '2027-10-24' }, 'to'],
    ['more than 366 days', { to: '2028-10-25' }, 'to'],
    ['an impossible start time', { startTime: '25:00' }, 'startTime'],
    ['an impossible end time', { endTime: '10:61' }, 'endTime'],
    ['an unknown person', { assigneeIds: [987654] }, 'assigneeIds'],
    ['an unknown site', { siteId: 987654 }, 'siteId']
  ]
  for (const [name, over, field] of bad) {
    it(`answers 400 naming ${field} for ${name}, and writes nothing`, async () => {
      const shiftsBefore = countRows('shifts')
      const reply = await coordinator.post('/api/rotations', { ...good(), ...over })
      expect(reply.status).toBe(400)
      expect(reply.body.message).toContain(field)
      expect(countRows('shifts')).toBe(shiftsBefore)
      expect(countRows('rotations')).toBe(0)
    })
  }

  it('makes, reads, decides as one, re-opens one shift alone, changes and cancels from a date', async () => {
    const made = await coordinator.post('/api/rotations', good())
    expect(made.status).toBe(201)
    const { rotation, shifts, summary } = made.body
    expect(shifts).toHaveLength(12)
    for (const s of shifts) {
      expect(intlWall(s.start)).toBe(`${s.start.slice(0, 10)} 10:00`)
      expect(s.rotationId).toBe(rotation.id)
    }
    expect(summary.shifts).toBe(12)
    expect(summary.flagged).toBeGreaterThan(0)

    const read = await coordinator.get(`/api/rotations/${rotation.id}`)
    expect(read.body.shifts.map((s: { id: number }) => s.id)).toEqual(shifts.map((s: { id: number }) => s.id))
    expect((await coordinator.post(`/api/rotations/${rotation.id}/review`, { decision: 'approved', mitigations: ['other:radio'] })).status).toBe(403)

    const decided = await safety.post(`/api/rotations/${rotation.id}/review`, { decision: 'approved', mitigations: ['check-in-interval:30'] })
    expect(decided.status).toBe(200)
    expect(decided.body.decided).toBe(summary.flagged)

    const target = shifts.find((s: { lightCheck: { flagged: boolean } }) => s.lightCheck.flagged)
    const patched = await coordinator.patch(`/api/shifts/${target.id}`, { start: target.start.replace('T10:00', 'T09:00') })
    expect(patched.status).toBe(200)
    const after = (await coordinator.get(`/api/rotations/${rotation.id}`)).body.shifts
    expect(after.filter((s: { reviewState: string }) => s.reviewState === 'pending').map((s: { id: number }) => s.id)).toEqual([target.id])

    const changed = await coordinator.patch(`/api/rotations/${rotation.id}`, { fromDate: '2027-11-08', endTime: '15:00' })
    expect(changed.status).toBe(200)
    for (const s of changed.body.shifts) {
      expect(intlWall(s.end).slice(11)).toBe(s.start.slice(0, 10) >= '2027-11-08' ? '15:00' : '14:00')
    }
    const cancelled = await coordinator.delete(`/api/rotations/${rotation.id}?from=2027-11-10`)
    expect(cancelled.status).toBe(200)
    const gone = cancelled.body.shifts.filter((s: { cancelled: boolean }) => s.cancelled)
    expect(gone.length).toBe(cancelled.body.cancelled)
    expect(gone.every((s: { start: string }) => s.start.slice(0, 10) >= '2027-11-10')).toBe(true)
  })

  it('copies a week: 400 naming weekStart for an empty week, 201 with the copies otherwise, each an ordinary shift', async () => {
    const empty = await coordinator.post('/api/rotations/copy-week', { siteId: ids.site, weekStart: '2028-03-06', weeks: 1 })
    expect(empty.status).toBe(400)
    expect(empty.body.message).toContain('weekStart')
    const tooMany = await coordinator.post('/api/rotations/copy-week', { siteId: ids.site, weekStart: '2028-03-06', weeks: 13 })
    expect(tooMany.status).toBe(400)
    expect(tooMany.body.message).toContain('weeks')
    const made = await coordinator.post('/api/shifts', { siteId: ids.site, title: 'Odd week task', light: 'civil', start: '2028-03-07T11:00', end: '2028-03-07T13:30', assigneeIds: [ids.person] })
    expect(made.status).toBe(201)
    const copied = await coordinator.post('/api/rotations/copy-week', { siteId: ids.site, weekStart: '2028-03-06', weeks: 3 })
    expect(copied.status).toBe(201)
    expect(copied.body.created).toBe(3)
    for (const id of copied.body.shiftIds) {
      const s = (await coordinator.get(`/api/shifts/${id}`)).body
      expect(intlWall(s.start).slice(11)).toBe('11:00')
      expect(intlWall(s.end).slice(11)).toBe('13:30')
      expect(s.assigneeIds).toEqual([ids.person])
      expect(s.rotationId).toBeNull()
    }
  })

  it('answers 400 naming fromDate for a change without it, and 404 for an unknown rotation', async () => {
    const noDate = await coordinator.patch('/api/rotations/1', { title: 'x' })
    expect(noDate.status).toBe(400)
    expect(noDate.body.message).toContain('fromDate')
    expect((await coordinator.get('/api/rotations/987654')).status).toBe(404)
  })
})
