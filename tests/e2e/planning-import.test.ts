import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

// Spreadsheet import over HTTP on the built server: a full 10,000-row file (the limit) is previewed
// and written in one go; a file with one bad row, or one row too many, writes nothing. The demo
// scenario's site names and e-mails are used; dates are in 2028, far from the seeded weeks.
let server: AppServer
let coordinator: ApiClient
const HEADER = 'site,title,start,end,light,assignees,notes'
const SITES = ['Kvitfjell Ice Camp', 'Ravnvik Pipeline Yard', 'Saqqaq Ridge Survey', 'Tamarack Creek Mine']

function countShifts() {
  const db = new Database(server.databasePath, { readonly: true, fileMustExist: true })
  try {
    return (db.prepare('select count(*) as n from shifts').get() as { n: number }).n
  } finally {
    db.close()
  }
}

function pad(n: number) {
  return String(n).padStart(2, '0')
}

// Row i: one of four sites, a day in 2028 and an hour of that day; every 40th row names a person.
function plannedRow(i: number) {
  const day = new Date(Date.UTC(2028, 0, 1 + Math.floor(i / 4) % 360))
  const date = day.toISOString().slice(0, 10)
  const hour = 6 + (i % 4) * 3
  const assignees = i % 40 === 0 ? 'liv.aasen@gloamline.test' : ''
  return `${SITES[i % 4]},Survey leg ${i},${date} ${pad(hour)}:00,${date} ${pad(hour + 2)}:30,${i % 3 === 0 ? 'daylight' : 'civil'},${assignees},Leg ${i}`
}

function file(count: number, extra: string[] = []) {
  return [HEADER, ...Array.from({ length: count }, (_, i) => plannedRow(i)), ...extra].join('\n')
}

beforeAll(async () => {
  server = await startAppServer()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

describe('shift import over HTTP', () => {
  it('serves the template as CSV with the documented header', async () => {
    const reply = await coordinator.get('/api/import/shifts/template')
    expect(reply.status).toBe(200)
    expect(reply.headers.get('content-type')).toContain('text/csv')
    const lines = String(reply.body).trim().split(/\r?\n/)
    expect(lines[0]).toBe(HEADER)
    expect(lines).toHaveLength(3)
  })

  it('writes nothing when one row of 500 is bad, answering 400 with the row and reason', async () => {
    const before = countShifts()
    const reply = await coordinator.post('/api/import/shifts', { csv: file(499, ['Nowhere Camp,Survey leg x,2028-02-01 10:00,2028-02-01 12:00,civil,,']) })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toBe('1 of 500 rows have errors; nothing was imported')
    expect(reply.body.data.rows.filter((r: any) => !r.ok)).toEqual([expect.objectContaining({ row: 501, errors: ['site: no site named “Nowhere Camp”'] })])
    expect(countShifts()).toBe(before)
  })

  it('refuses 10,001 rows with a clear message and writes nothing', async () => {
    const before = countShifts()
    const reply = await coordinator.post('/api/import/shifts', { csv: file(10_001) })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/at most 10,000 can be imported/)
    expect(countShifts()).toBe(before)
  })

  it('previews a 10,000-row file with a light check on every row, then writes all of it', async () => {
    const csv = file(10_000)
    const preview = await coordinator.post('/api/import/shifts/preview', { csv })
    expect(preview.status).toBe(200)
    expect(preview.body.valid).toBe(true)
    expect(preview.body.rows).toHaveLength(10_000)
    expect(preview.body.rows[9_999].row).toBe(10_001)
    expect(preview.body.rows.every((r: any) => r.lightCheck && typeof r.lightCheck.minutesBelow === 'number')).toBe(true)
    const before = countShifts()
    const reply = await coordinator.post('/api/import/shifts', { csv })
    expect(reply.status).toBe(201)
    expect(reply.body.created).toBe(10_000)
    expect(reply.body.ids).toHaveLength(10_000)
    // a roster this size is not announced shift by shift (one mail per flagged shift): the reply says so
    expect(reply.body.notified).toBe(false)
    expect(countShifts()).toBe(before + 10_000)
  })

  it('refuses the same file again: every row is already planned', async () => {
    const before = countShifts()
    const reply = await coordinator.post('/api/import/shifts', { csv: file(20) })
    expect(reply.status).toBe(400)
    expect(reply.body.data.rows[0].errors[0]).toMatch(/^already planned/)
    expect(countShifts()).toBe(before)
  })

  it('answers 400 naming csv when the body has no file text', async () => {
    const reply = await coordinator.post('/api/import/shifts/preview', { file: 'x' })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('csv')
  })
})

describe('people import over HTTP', () => {
  it('adds people and creates their crews in one go', async () => {
    const csv = 'name,email,role,crews\nSiri Haugland,siri.haugland@gloamline.test,crew,Rime crew;Tundra crew\nOle Kristiansen,ole.kristiansen@gloamline.test,crew,Tundra crew'
    const reply = await coordinator.post('/api/import/people', { csv })
    expect(reply.status).toBe(201)
    expect(reply.body).toMatchObject({ created: 2, crewsCreated: 1, membershipsAdded: 3 })
    const crews = (await coordinator.get('/api/crews')).body
    const tundra = crews.find((c: any) => c.name === 'Tundra crew')
    expect(tundra.members.map((m: any) => m.name).sort()).toEqual(['Ole Kristiansen', 'Siri Haugland'])
  })

  it('serves its template', async () => {
    const reply = await coordinator.get('/api/import/people/template')
    expect(String(reply.body).split(/\r?\n/)[0]).toBe('name,email,role,crews')
  })
})
