import { eq, sql } from 'drizzle-orm'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import type { AppDatabase } from '../../server/utils/db'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { auditLog, crewMembers, crews, people } from '../../server/db/schema'
import { buildPeopleImportTemplate, importPeopleFromCsv, previewPeopleImport } from '../../server/services/people-import'

// People and crews import against a fresh SQLite file with the migrations applied (invented people).
let db: AppDatabase
let actorId: number
let rimeId: number

function counts() {
  const n = (table: typeof people | typeof crews | typeof crewMembers | typeof auditLog) => db.select({ n: sql<number>`count(*)` }).from(table).get()!.n
  return { people: n(people), crews: n(crews), members: n(crewMembers), audit: n(auditLog) }
}

beforeEach(() => {
  db = createTestDatabase('gloamline-people-import-')
  actorId = db.insert(people).values({ name: 'Test Coordinator', email: 'coord@import.gloamline.test', role: 'coordinator' }).returning().get().id
  db.insert(people).values({ name: 'Liv Test', email: 'liv@import.gloamline.test', role: 'crew' }).run()
  rimeId = db.insert(crews).values({ name: 'Rime crew' }).returning().get().id
})
afterEach(() => {
  db.$client.close()
  removeTestDatabases()
})

describe('people import', () => {
  it('adds new people, creates missing crews, and only adds crews for someone already registered', () => {
    const file = [
      'name,email,role,crews',
      'Siri Test,SIRI@import.gloamline.test,Crew,rime CREW;Tundra crew',
      'Liv Renamed,liv@import.gloamline.test,safety,Tundra crew',
      'Ole Test,ole@import.gloamline.test,safety,'
    ].join('\n')
    const preview = previewPeopleImport(db, file)
    expect(preview.valid).toBe(true)
    expect(preview.crewsToCreate).toEqual(['Tundra crew'])
    expect(preview.rows[1]!.notes).toEqual([expect.stringContaining('already registered')])
    const result = importPeopleFromCsv(db, actorId, file)
    expect(result).toMatchObject({ created: 2, crewsCreated: 1, membershipsAdded: 3 })
    const siri = db.select().from(people).where(eq(people.email, 'siri@import.gloamline.test')).get()!
    expect(siri).toMatchObject({ name: 'Siri Test', role: 'crew', passwordHash: null })
    const liv = db.select().from(people).where(eq(people.email, 'liv@import.gloamline.test')).get()!
    expect(liv).toMatchObject({ name: 'Liv Test', role: 'crew' })
    const rime = db.select().from(crewMembers).where(eq(crewMembers.crewId, rimeId)).all()
    expect(rime.map(m => m.personId)).toEqual([siri.id])
  })

  it('writes nothing when any row is bad: bad role, bad e-mail, duplicate e-mail, missing name', () => {
    const before = counts()
    const file = [
      'name,email,role,crews',
      'Siri Test,siri@import.gloamline.test,crew,Tundra crew',
      'Ole Test,ole@import.gloamline.test,captain,',
      'Pia Test,not-an-email,crew,',
      'Siri Again,siri@import.gloamline.test,crew,',
      ',nameless@import.gloamline.test,crew,'
    ].join('\n')
    let status: number | undefined
    let data: any
    try {
      importPeopleFromCsv(db, actorId, file)
    } catch (error: any) {
      status = error.statusCode
      data = error.data
    }
    expect(status).toBe(400)
    expect(counts()).toEqual(before)
    expect(data.rows.map((r: any) => [r.row, r.ok])).toEqual([[2, true], [3, false], [4, false], [5, false], [6, false]])
    expect(data.rows[1].errors[0]).toMatch(/^role:/)
    expect(data.rows[2].errors[0]).toMatch(/^email:/)
    expect(data.rows[3].errors).toEqual(['email: duplicate of row 2'])
    expect(data.rows[4].errors[0]).toMatch(/^name:/)
  })

  it('refuses a file without the email column', () => {
    const preview = previewPeopleImport(db, 'name,role\nSiri Test,crew')
    expect(preview).toMatchObject({ valid: false, rows: [], errors: [expect.stringContaining('Missing column: email')] })
  })

  it('offers a template that previews as valid', () => {
    const preview = previewPeopleImport(db, buildPeopleImportTemplate())
    expect(preview.valid).toBe(true)
    expect(preview.rows).toHaveLength(2)
  })
})
