// People and crews import from a spreadsheet: one row per person (name, e-mail, role, crews). New
// people are added without a password (they are invited separately); someone already registered keeps
// their name and role, and only joins the listed crews. Crews named in the file are created if missing.
// Nothing is written unless every row is valid, and then everything in one transaction.
import { crewMembers, crews, people } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { fieldError } from '../utils/errors'
import { recordAudit } from './audit'
import { readCsvTable, writeCsvText, type CsvRow } from '../core/planning/csv'
import { EmailSchema, PersonNameSchema, RoleSchema } from '../utils/validation'
import { CrewNameSchema } from './crews'

export const PEOPLE_IMPORT_COLUMNS = ['name', 'email', 'role', 'crews']
const REQUIRED_COLUMNS = ['name', 'email', 'role']

type Role = 'coordinator' | 'safety' | 'crew'
type Reader = Pick<AppDatabase, 'select'>
type Tx = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]

export interface ImportedPerson {
  name: string
  email: string
  role: Role
  crews: string[]
  // set when someone with this e-mail is already registered
  existingId: number | null
}

export interface PeopleImportRow {
  row: number
  ok: boolean
  errors: string[]
  notes: string[]
  person?: ImportedPerson
}

export interface PeopleImportPreview {
  valid: boolean
  rows: PeopleImportRow[]
  errors: string[]
  // crews the file names that do not exist yet
  crewsToCreate: string[]
}

/** The downloadable template: the header and two example rows of the demo scenario. */
export function buildPeopleImportTemplate(): string {
  return writeCsvText(PEOPLE_IMPORT_COLUMNS, [
    ['Siri Haugland', 'siri.haugland@gloamline.test', 'crew', 'Rime crew;Lantern crew'],
    ['Ole Kristiansen', 'ole.kristiansen@gloamline.test', 'crew', 'Tundra crew']
  ])
}

function firstIssue(result: { success: boolean, error?: { issues: { message: string }[] } }) {
  return result.error?.issues[0]?.message ?? 'invalid'
}

function readCrewNames(cell: string, errors: string[]): string[] {
  const names = new Map<string, string>()
  for (const raw of cell.split(';')) {
    const parsed = CrewNameSchema.safeParse(raw)
    if (!raw.trim()) continue
    if (!parsed.success) errors.push(`crews: “${raw.trim()}”: ${firstIssue(parsed)}`)
    else if (!names.has(parsed.data.toLocaleLowerCase('en'))) names.set(parsed.data.toLocaleLowerCase('en'), parsed.data)
  }
  return [...names.values()]
}

function parsePersonRow(row: CsvRow, existing: Map<string, { id: number, name: string, role: Role }>): PeopleImportRow {
  const errors = [...row.errors]
  const notes: string[] = []
  const name = PersonNameSchema.safeParse(row.cells.get('name') ?? '')
  const email = EmailSchema.safeParse(row.cells.get('email') ?? '')
  const role = RoleSchema.safeParse((row.cells.get('role') ?? '').toLowerCase())
  if (!name.success) errors.push(`name: ${firstIssue(name)}`)
  if (!email.success) errors.push(`email: ${firstIssue(email)}`)
  if (!role.success) errors.push(`role: ${firstIssue(role)}`)
  const crewNames = readCrewNames(row.cells.get('crews') ?? '', errors)
  const result: PeopleImportRow = { row: row.row, ok: errors.length === 0, errors, notes }
  if (!result.ok || !name.success || !email.success || !role.success) return result
  const found = existing.get(email.data)
  if (found && (found.name !== name.data || found.role !== role.data)) {
    notes.push(`${email.data} is already registered as ${found.name} (${found.role}); name and role stay as they are, only crews are added`)
  }
  result.person = { name: name.data, email: email.data, role: role.data, crews: crewNames, existingId: found?.id ?? null }
  return result
}

function markDuplicateEmails(rows: PeopleImportRow[]) {
  const seen = new Map<string, number>()
  for (const r of rows) {
    if (!r.person) continue
    const earlier = seen.get(r.person.email)
    if (earlier === undefined) {
      seen.set(r.person.email, r.row)
      continue
    }
    r.errors.push(`email: duplicate of row ${earlier}`)
    r.ok = false
    delete r.person
  }
}

function findCrewsToCreate(db: Reader, rows: PeopleImportRow[]) {
  const known = new Set(db.select({ name: crews.name }).from(crews).all().map(c => c.name.toLocaleLowerCase('en')))
  const missing = new Map<string, string>()
  for (const name of rows.flatMap(r => r.person?.crews ?? [])) {
    const key = name.toLocaleLowerCase('en')
    if (!known.has(key) && !missing.has(key)) missing.set(key, name)
  }
  return [...missing.values()]
}

/** Validates a people CSV row by row; writes nothing. */
export function previewPeopleImport(db: Reader, csv: string): PeopleImportPreview {
  const table = readCsvTable(csv, REQUIRED_COLUMNS, ['crews'])
  if (table.errors.length) return { valid: false, rows: [], errors: table.errors, crewsToCreate: [] }
  const existing = new Map(db.select({ id: people.id, email: people.email, name: people.name, role: people.role }).from(people).all()
    .map(p => [p.email.toLowerCase(), { id: p.id, name: p.name, role: p.role }]))
  const rows = table.rows.map(row => parsePersonRow(row, existing))
  markDuplicateEmails(rows)
  return { valid: rows.every(r => r.ok), rows, errors: [], crewsToCreate: findCrewsToCreate(db, rows) }
}

function ensureCrews(tx: Tx, names: string[]) {
  const byKey = new Map(tx.select({ id: crews.id, name: crews.name }).from(crews).all().map(c => [c.name.toLocaleLowerCase('en'), c.id]))
  let created = 0
  for (const name of names) {
    const key = name.toLocaleLowerCase('en')
    if (byKey.has(key)) continue
    byKey.set(key, tx.insert(crews).values({ name }).returning({ id: crews.id }).get().id)
    created++
  }
  return { byKey, created }
}

function writePeopleRows(tx: Tx, rows: PeopleImportRow[]) {
  const { byKey, created: crewsCreated } = ensureCrews(tx, rows.flatMap(r => r.person!.crews))
  const ids: number[] = []
  let membershipsAdded = 0
  for (const r of rows) {
    const p = r.person!
    const personId = p.existingId ?? tx.insert(people).values({ name: p.name, email: p.email, role: p.role }).returning({ id: people.id }).get().id
    if (p.existingId === null) ids.push(personId)
    for (const crew of p.crews) {
      const added = tx.insert(crewMembers).values({ crewId: byKey.get(crew.toLocaleLowerCase('en'))!, personId }).onConflictDoNothing().run()
      membershipsAdded += added.changes
    }
  }
  return { created: ids.length, ids, crewsCreated, membershipsAdded }
}

/** Imports every row of a people CSV in one transaction, or nothing when any row is bad. */
export function importPeopleFromCsv(db: AppDatabase, actorId: number, csv: string, afterWrite?: (tx: Tx, createdIds: number[]) => number[]) {
  return db.transaction((tx) => {
    const preview = previewPeopleImport(tx, csv)
    if (!preview.valid) {
      const bad = preview.rows.filter(r => !r.ok).length
      const message = preview.errors[0] ?? `${bad} of ${preview.rows.length} rows have errors; nothing was imported`
      throw fieldError('csv', message, { data: { ...preview }, title: message })
    }
    const result = writePeopleRows(tx, preview.rows)
    recordAudit(tx, actorId, 'people.import', 'person', null, { ...result })
    // e.g. the set-password invitations of the people just added, in the same transaction
    const messageIds = afterWrite ? afterWrite(tx, result.ids) : []
    return { ...result, messageIds }
  })
}
