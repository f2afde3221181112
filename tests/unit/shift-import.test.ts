import { eq, sql } from 'drizzle-orm'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import type { AppDatabase } from '../../server/utils/db'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { auditLog, people, shiftAssignees, shifts, sites } from '../../server/db/schema'
import Papa from 'papaparse'
import { buildShiftImportTemplate, importShiftsFromCsv, previewShiftImport, suggestSiteName } from '../../server/services/shift-import'
import { findShiftsInRange } from '../../server/services/shifts'
import { SHIFT_CSV_COLUMNS, toShiftCsvRows } from '../../shared/shift-table'
import { MAX_IMPORT_ROWS } from '../../server/core/planning/csv'

// Shift import against a fresh SQLite file with the migrations applied. Sites, people and shifts are
// invented for the test; the light figures checked here are whole-shift cases whose answer follows
// from the noon altitude h = 90° − |φ − δ| (standard spherical astronomy) with the sun's declination
// δ ≈ −23.2° in mid-December (Astronomical Almanac, from memory): at 78.22° N the sun stays below
// −11° all day, so every minute of a civil or daylight shift is below its requirement.
const HEADER = 'site,title,start,end,light,assignees,notes'
let db: AppDatabase
let actorId: number
let ids: { camp: number, yard: number, quarry: number, liv: number, kalle: number }

function count(table: typeof shifts | typeof shiftAssignees | typeof auditLog) {
  return db.select({ n: sql<number>`count(*)` }).from(table).get()!.n
}

function csv(...rows: string[]) {
  return [HEADER, ...rows].join('\n')
}

function seedBasics() {
  const [camp, yard, quarry] = db.insert(sites).values([
    { name: 'Kvitfjell Ice Camp', latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen', defaultLight: 'civil' },
    { name: 'Ravnvik Pipeline Yard', latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' },
    { name: 'Old Quarry', latitude: 70.1, longitude: 25.1, timezone: 'Europe/Oslo', archivedAt: new Date() }
  ]).returning().all()
  const [coord, liv, kalle] = db.insert(people).values([
    { name: 'Test Coordinator', email: 'coord@import.gloamline.test', role: 'coordinator' },
    { name: 'Liv Test', email: 'liv@import.gloamline.test', role: 'crew' },
    { name: 'Kalle Test', email: 'kalle@import.gloamline.test', role: 'crew' },
    { name: 'Gone Test', email: 'gone@import.gloamline.test', role: 'crew', active: false }
  ]).returning().all()
  actorId = coord!.id
  ids = { camp: camp!.id, yard: yard!.id, quarry: quarry!.id, liv: liv!.id, kalle: kalle!.id }
}

beforeEach(() => {
  db = createTestDatabase('gloamline-import-')
  seedBasics()
})
afterEach(() => {
  db.$client.close()
  removeTestDatabases()
})

const VALID = csv(
  'Kvitfjell Ice Camp,Snow-machine route check,2027-12-15 09:00,2027-12-15 13:00,,liv@import.gloamline.test;kalle@import.gloamline.test,"Carry flags, radio"',
  'ravnvik pipeline yard,Crossing inspection,2027-06-15 10:00,2027-06-15 13:00,daylight,KALLE@import.gloamline.test,',
  'Kvitfjell Ice Camp,Mast service,2027-12-16T10:00:00Z,2027-12-16T12:00:00Z,any,,'
)

describe('a valid file', () => {
  it('writes every row in one go, with light checks, review states and assignees', () => {
    const result = importShiftsFromCsv(db, actorId, VALID)
    expect(result.created).toBe(3)
    expect(count(shifts)).toBe(3)
    expect(count(shiftAssignees)).toBe(3)
    const rows = db.select().from(shifts).orderBy(shifts.id).all()
    // row 2: blank light takes the site's default (civil); polar night at 78° N: all 240 min below
    expect(rows[0]).toMatchObject({ siteId: ids.camp, light: 'civil', minutesBelow: 240, flagged: true, reviewState: 'pending', notes: 'Carry flags, radio' })
    // row 3: site names match in any case; local time in Europe/Oslo (UTC+2 in June)
    expect(rows[1]).toMatchObject({ siteId: ids.yard, startAt: new Date('2027-06-15T08:00:00Z') })
    // row 4: an artificially lit task is never below requirement
    expect(rows[2]).toMatchObject({ light: 'any', minutesBelow: 0, flagged: false, reviewState: 'not-needed' })
    const audit = db.select().from(auditLog).where(eq(auditLog.action, 'shift.import')).all()
    expect(audit).toHaveLength(1)
    expect(audit[0]!.detail).toMatchObject({ created: 3, flagged: 1 })
  })

  it('previews every row with its spreadsheet row number, light check and shift, writing nothing', () => {
    const preview = previewShiftImport(db, VALID)
    expect(preview.valid).toBe(true)
    expect(preview.rows.map(r => r.row)).toEqual([2, 3, 4])
    expect(preview.rows[0]).toMatchObject({
      ok: true,
      errors: [],
      shift: { siteId: ids.camp, siteName: 'Kvitfjell Ice Camp', start: '2027-12-15T09:00:00+01:00', end: '2027-12-15T13:00:00+01:00', light: 'civil', assigneeIds: [ids.liv, ids.kalle] },
      lightCheck: { requirement: 'civil', minutesBelow: 240, flagged: true },
      conflicts: []
    })
    expect(count(shifts)).toBe(0)
  })

  it('keeps row numbers across blank lines and notes a time that does not exist on the clock', () => {
    // 2027-03-28 02:30 is skipped in Europe/Oslo (EU summer time starts at 01:00 UTC on the last Sunday of March)
    const preview = previewShiftImport(db, csv('', 'Ravnvik Pipeline Yard,Night pump check,2027-03-28 02:30,2027-03-28 04:00,any,,'))
    expect(preview.rows).toHaveLength(1)
    expect(preview.rows[0]!.row).toBe(3)
    expect(preview.rows[0]!.shift!.start).toBe('2027-03-28T03:30:00+02:00')
    expect(preview.rows[0]!.timeNotes).toEqual([expect.stringContaining('does not exist')])
  })

  it('shows conflicts as warnings, between rows of the file and with stored shifts, without failing a row', () => {
    const stored = db.insert(shifts).values({ siteId: ids.yard, title: 'Stored night watch', startAt: new Date('2027-06-14T17:00:00Z'), endAt: new Date('2027-06-14T23:00:00Z'), light: 'any' }).returning().get()
    db.insert(shiftAssignees).values({ shiftId: stored.id, personId: ids.kalle }).run()
    const preview = previewShiftImport(db, csv(
      'Ravnvik Pipeline Yard,Early weld check,2027-06-15 05:00,2027-06-15 09:00,any,kalle@import.gloamline.test,',
      'Ravnvik Pipeline Yard,Crossing inspection,2027-06-15 08:00,2027-06-15 11:00,any,kalle@import.gloamline.test,'
    ))
    expect(preview.valid).toBe(true)
    // 23:00 UTC to 03:00 UTC (05:00 local) is 4 h of rest; EU Working Time Directive 2003/88/EC art. 3 asks for 11 h
    expect(preview.rows[0]!.conflicts!.map(c => [c.kind, c.otherShiftId])).toEqual([['rest', stored.id], ['overlap', null]])
    expect(preview.rows[0]!.conflicts![1]!.message).toContain('row 3 of this file')
    expect(preview.rows[1]!.conflicts!.map(c => [c.kind, c.otherShiftId])).toEqual([['rest', stored.id], ['overlap', null]])
  })

  it('offers a template with generic example rows, not any team\'s names', () => {
    const template = buildShiftImportTemplate(Date.UTC(2027, 0, 10))
    expect(template.split('\r\n')[0]).toBe(HEADER)
    expect(template).not.toMatch(/gloamline\.test|Kvitfjell|Ravnvik/)
    expect(template).toContain('2027-01-11 09:00')
    const preview = previewShiftImport(db, template)
    expect(preview.rows).toHaveLength(2)
    // placeholders: only the site name and the addresses need replacing
    expect(preview.rows.flatMap(r => r.errors).every(e => e.startsWith('assignees:') || e.startsWith('site:'))).toBe(true)
  })
})

describe('the spreadsheet round trip', () => {
  function exportWeek() {
    const views = findShiftsInRange(db, { from: '2027-06-14', to: '2027-06-21' })
    const rows = toShiftCsvRows(views, db.select({ id: people.id, email: people.email }).from(people).all())
    // as the shift list's download writes it (composables/useCsvDownload.ts)
    return Papa.unparse(rows, { columns: [...SHIFT_CSV_COLUMNS], newline: '\r\n', escapeFormulae: true })
  }
  const WEEK = csv(
    'Ravnvik Pipeline Yard,Crossing inspection,2027-06-15 10:00,2027-06-15 13:00,daylight,kalle@import.gloamline.test,"-20 m rope, radio"',
    'Kvitfjell Ice Camp,"Mast service, north side",2027-06-16 22:00,2027-06-17 02:00,any,liv@import.gloamline.test;kalle@import.gloamline.test,'
  )

  it('re-imports an exported week unchanged: every row names its shift and nothing is written', () => {
    expect(importShiftsFromCsv(db, actorId, WEEK).created).toBe(2)
    const before = db.select().from(shifts).all()
    const file = exportWeek()
    const preview = previewShiftImport(db, file)
    expect(preview.valid, JSON.stringify(preview.rows)).toBe(true)
    expect(preview.rows.map(r => [r.action, r.shiftId])).toEqual(before.map(b => ['unchanged', b.id]))
    const result = importShiftsFromCsv(db, actorId, file)
    expect(result).toMatchObject({ created: 0, updated: 0, unchanged: 2 })
    expect(db.select().from(shifts).all()).toEqual(before)
  })

  it('changes the shift a row names when a cell was edited, and adds a row without an id', () => {
    importShiftsFromCsv(db, actorId, WEEK)
    const lines = exportWeek().split('\r\n')
    lines[1] = lines[1]!.replace('Crossing inspection', 'Crossing inspection and log')
    lines.push(',Ravnvik Pipeline Yard,Valve check,2027-06-18 10:00,2027-06-18 12:00,daylight,liv@import.gloamline.test,')
    const preview = previewShiftImport(db, lines.join('\r\n'))
    expect(preview.rows.map(r => r.action)).toEqual(['update', 'unchanged', 'create'])
    const result = importShiftsFromCsv(db, actorId, lines.join('\r\n'))
    expect(result).toMatchObject({ created: 1, updated: 1, unchanged: 1 })
    expect(db.select().from(shifts).where(eq(shifts.id, preview.rows[0]!.shiftId!)).get()!.title).toBe('Crossing inspection and log')
  })

  it('asks "did you mean" for a near-miss site name', () => {
    const preview = previewShiftImport(db, csv('Ravnvik Pipline Yard,Crossing inspection,2027-06-15 10:00,2027-06-15 13:00,daylight,,'))
    expect(preview.rows[0]!.errors).toEqual(['site: no site named “Ravnvik Pipline Yard”; did you mean “Ravnvik Pipeline Yard”?'])
    expect(suggestSiteName('Kvitfjel ice camp', ['Kvitfjell Ice Camp', 'Ravnvik Pipeline Yard'])).toBe('Kvitfjell Ice Camp')
    expect(suggestSiteName('Somewhere else entirely', ['Kvitfjell Ice Camp', 'Ravnvik Pipeline Yard'])).toBeNull()
  })
})

function expectNothingWritten(file: string) {
  const before = { shifts: count(shifts), assignees: count(shiftAssignees), audit: count(auditLog) }
  let status: number | undefined
  let data: any
  try {
    importShiftsFromCsv(db, actorId, file)
  } catch (error: any) {
    status = error.statusCode
    data = error.data
  }
  expect(status).toBe(400)
  expect({ shifts: count(shifts), assignees: count(shiftAssignees), audit: count(auditLog) }).toEqual(before)
  return data
}

describe('a bad file writes nothing', () => {
  it('refuses a missing column', () => {
    const data = expectNothingWritten('site,title,start,light,assignees\nKvitfjell Ice Camp,Route check,2027-12-15 09:00,civil,')
    expect(data.errors).toEqual([expect.stringContaining('Missing column: end')])
    expect(data.rows).toEqual([])
  })

  it('refuses a bad date and a date in another format, naming the row and column', () => {
    const data = expectNothingWritten(csv(
      'Kvitfjell Ice Camp,Route check,2027-02-30 09:00,2027-02-30 13:00,civil,,',
      'Kvitfjell Ice Camp,Route check,14/01/2027 08:00,2027-01-14 10:00,civil,,',
      'Kvitfjell Ice Camp,Route check,2027-01-14 10:00,2027-01-14 09:00,civil,,',
      'Kvitfjell Ice Camp,Route check,2027-01-14 10:00,2027-01-24 09:00,civil,,'
    ))
    expect(data.rows.map((r: any) => [r.row, r.ok, r.errors[0]])).toEqual([
      [2, false, expect.stringMatching(/^start: no such date/)],
      [3, false, expect.stringMatching(/^start: expected a local time as YYYY-MM-DD HH:mm/)],
      [4, false, 'end: must be after start'],
      [5, false, 'end: a shift may last at most 7 days']
    ])
  })

  it('refuses an unknown or archived site, and an unknown or deactivated person', () => {
    const data = expectNothingWritten(csv(
      'Kvitfjell Ice Camp,Route check,2027-12-15 09:00,2027-12-15 13:00,civil,liv@import.gloamline.test,',
      'Nowhere Camp,Route check,2027-12-15 09:00,2027-12-15 13:00,civil,,',
      'Old Quarry,Route check,2027-12-15 09:00,2027-12-15 13:00,civil,,',
      'Kvitfjell Ice Camp,Mast check,2027-12-15 09:00,2027-12-15 13:00,civil,nobody@import.gloamline.test;gone@import.gloamline.test,'
    ))
    expect(data.valid).toBe(false)
    expect(data.rows.map((r: any) => r.ok)).toEqual([true, false, false, false])
    expect(data.rows[1].errors).toEqual(['site: no site named “Nowhere Camp”'])
    expect(data.rows[2].errors).toEqual(['site: “Old Quarry” is archived'])
    expect(data.rows[3].errors).toEqual(['assignees: no person with e-mail nobody@import.gloamline.test', 'assignees: gone@import.gloamline.test is deactivated'])
  })

  it('refuses a duplicate row, in the file or of a shift already planned', () => {
    importShiftsFromCsv(db, actorId, VALID)
    const data = expectNothingWritten(csv(
      'Kvitfjell Ice Camp,Ice core transfer,2027-12-20 09:00,2027-12-20 11:00,any,,',
      'Kvitfjell Ice Camp,ice core transfer,2027-12-20 09:00,2027-12-20 11:00,any,,',
      'Ravnvik Pipeline Yard,Crossing inspection,2027-06-15 10:00,2027-06-15 13:00,daylight,,'
    ))
    expect(data.rows[1].errors).toEqual(['duplicate of row 2 (same site, title, start and end)'])
    expect(data.rows[2].errors).toEqual([expect.stringMatching(/^already planned: shift #\d+/)])
  })

  it('refuses a bad light requirement and a missing title', () => {
    const data = expectNothingWritten(csv('Kvitfjell Ice Camp,,2027-12-15 09:00,2027-12-15 13:00,moonlight,,'))
    expect(data.rows[0].errors).toEqual(['title: required', 'light: must be daylight, civil or any, not “moonlight”'])
  })

  it(`refuses more than ${MAX_IMPORT_ROWS} rows with a clear message`, () => {
    const row = 'Kvitfjell Ice Camp,Route check,2027-12-15 09:00,2027-12-15 13:00,civil,,'
    const data = expectNothingWritten(csv(...Array.from({ length: MAX_IMPORT_ROWS + 1 }, () => row)))
    expect(data.errors).toEqual(['The file has 10,001 rows; at most 10,000 can be imported at once. Split it into smaller files.'])
  })

  it('refuses a file that is not CSV: a workbook, binary bytes, no header, or empty', () => {
    expect(expectNothingWritten('PK\u0003\u0004\u0014\u0000\u0006\u0000[Content_Types].xml').errors[0]).toMatch(/not a CSV text file/)
    expect(expectNothingWritten('\u0000\u0001\u0002\u0003binary\u0004\u0005\u0006\u0007\u0008').errors[0]).toMatch(/not a CSV text file/)
    expect(expectNothingWritten('Kvitfjell Ice Camp,Route check,2027-12-15 09:00,2027-12-15 13:00,civil,,').errors[0]).toMatch(/^The first row must be the header/)
    expect(expectNothingWritten('').errors).toEqual(['The file is empty'])
    expect(expectNothingWritten(`${HEADER}\n\n`).errors).toEqual(['The file has a header but no rows'])
  })

  it('refuses a row with an unclosed quotation mark', () => {
    const data = expectNothingWritten(csv('Kvitfjell Ice Camp,"Route check,2027-12-15 09:00,2027-12-15 13:00,civil,,'))
    expect(data.rows[0].errors).toContain('a quoted value is not closed (check the quotation marks)')
  })
})
