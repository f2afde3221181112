// Shift import from a spreadsheet: every row is validated and light-checked in a preview; the import
// writes only when every row is valid, all rows in one transaction, and refuses the whole file
// otherwise. Conflicts are warnings, as on the form: they never make a row invalid.
import { and, inArray, isNull, lt, gt } from 'drizzle-orm'
import { LIGHT_REQUIREMENTS, people, shiftAssignees, shifts, sites, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { fieldError } from '../utils/errors'
import { recordAudit } from './audit'
import { checkShiftLight } from '../core/light/check'
import { addConflictNeighbours, checkConflictsWith, loadConflictContext } from './conflict-context'
import type { NeighbourShift, ShiftConflict } from '../core/planning/conflicts'
import { readCsvTable, writeCsvText, type CsvRow } from '../core/planning/csv'
import { announceShiftChange } from './shift-notices'
import { MAX_SHIFT_MS, loadAssignees } from './shifts'
import { initialReviewState, updateShift } from './shift-writes'
import leven from 'leven'
import { assessShiftReview } from './reviews'
import { formatZonedIso, localDateOf, resolveLocalOrInstant } from '../core/time/zoned'
import { addDays } from '../../shared/format'
import { resolveWallTimeOnce } from '../core/time/instant-format'
import { InstantSchema } from '../utils/validation'
import { nowMs as clockNowMs } from '../core/time/clock'

export const SHIFT_IMPORT_COLUMNS = ['site', 'title', 'start', 'end', 'light', 'assignees', 'notes']
const REQUIRED_COLUMNS = ['site', 'title', 'start', 'end', 'light', 'assignees']
// `id` (from an export of the shift list) names a planned shift: the row updates it instead of adding one
const OPTIONAL_COLUMNS = ['notes', 'id']
const LOCAL_TIME_RE = /^(\d{4})-(\d{2})-(\d{2})[ T](\d{2}):(\d{2})(?::(\d{2}))?$/
const INSERT_CHUNK = 400
// Up to this many imported shifts are announced one by one, as the form would (safety officers hear
// of flagged work). A bigger roster would send a mail per flagged shift: it is left to the review
// queue, and the reply says no notices went out.
export const IMPORT_NOTICE_LIMIT = 200

export interface ImportedShift {
  siteId: number
  siteName: string
  title: string
  start: string
  end: string
  light: Shift['light']
  assigneeIds: number[]
  notes: string
}

export interface ShiftImportRow {
  row: number
  ok: boolean
  errors: string[]
  /** What importing the row does: add a shift, change the planned shift `shiftId`, or nothing (same as planned). */
  action?: 'create' | 'update' | 'unchanged'
  shiftId?: number
  shift?: ImportedShift
  lightCheck?: { requirement: Shift['light'], minutesBelow: number, flagged: boolean }
  conflicts?: ShiftConflict[]
  timeNotes?: string[]
}

export interface ShiftImportPreview {
  valid: boolean
  rows: ShiftImportRow[]
  errors: string[]
}

interface ParsedRow {
  preview: ShiftImportRow
  idCell?: string
  site?: Site
  startMs?: number
  endMs?: number
}

type Reader = Pick<AppDatabase, 'select'>

/**
 * The downloadable template: the header and two generic example rows, dated tomorrow (UTC). The site
 * names and addresses are placeholders to replace with your own, not any team's data.
 */
export function buildShiftImportTemplate(nowMs = clockNowMs()): string {
  const day = addDays(localDateOf(nowMs, 'UTC'), 1)
  return writeCsvText(SHIFT_IMPORT_COLUMNS, [
    ['Your site name', 'Task in a few words', `${day} 09:00`, `${day} 13:00`, 'civil', 'first.person@example.test;second.person@example.test', 'Anything the crew should know'],
    ['Your site name', 'Another task', `${day} 10:30`, `${day} 13:30`, 'daylight', 'first.person@example.test', '']
  ])
}

function isRealLocalTime(match: RegExpExecArray) {
  const [, y, mo, d, h, mi] = match.map(Number) as [number, number, number, number, number, number]
  const date = new Date(Date.UTC(y, mo - 1, d))
  const sameDay = date.getUTCFullYear() === y && date.getUTCMonth() === mo - 1 && date.getUTCDate() === d
  return sameDay && h < 24 && mi < 60
}

/** Reads a start/end cell: `YYYY-MM-DD HH:mm` in the site's zone, or an ISO instant with an offset. */
export function readImportTime(value: string, field: string, timezone: string | undefined): { ms?: number, note?: string, error?: string } {
  const local = LOCAL_TIME_RE.exec(value)
  if (local) {
    if (!isRealLocalTime(local)) return { error: `${field}: no such date or time “${value}”` }
    if (!timezone) return {}
    const wall = `${local[1]}-${local[2]}-${local[3]}T${local[4]}:${local[5]}`
    // the quick path answers times that happen once; gaps and overlaps take the shift rule and its note
    const once = resolveWallTimeOnce(`${wall}:00`, timezone)
    if (once !== null) return { ms: once }
    const resolved = resolveLocalOrInstant(wall, timezone)
    return { ms: resolved.ms, note: resolved.note }
  }
  if (InstantSchema.safeParse(value).success) return { ms: Date.parse(value) }
  return { error: `${field}: expected a local time as YYYY-MM-DD HH:mm in the site's zone${value ? `, not “${value}”` : ''}` }
}

interface Lookups {
  sitesByName: Map<string, Site[]>
  peopleByEmail: Map<string, { id: number, active: boolean }>
}

function loadLookups(db: Reader): Lookups {
  const sitesByName = new Map<string, Site[]>()
  for (const site of db.select().from(sites).all()) {
    const key = site.name.trim().toLocaleLowerCase('en')
    sitesByName.set(key, [...(sitesByName.get(key) ?? []), site])
  }
  const peopleByEmail = new Map(db.select({ id: people.id, email: people.email, active: people.active }).from(people).all()
    .map(p => [p.email.toLowerCase(), { id: p.id, active: p.active }]))
  return { sitesByName, peopleByEmail }
}

// Folds case and accents, so 'Ravnvik yard' and 'Rávnvik Yard' compare as the same letters.
function foldName(name: string): string {
  return name.normalize('NFD').replace(/\p{M}/gu, '').toLocaleLowerCase('en').replace(/\s+/g, ' ').trim()
}

/** The site name closest to a name that matched none (edit distance on folded names), if near enough. */
export function suggestSiteName(name: string, names: string[]): string | null {
  const wanted = foldName(name)
  let best: { name: string, distance: number } | null = null
  for (const candidate of names) {
    const distance = leven(wanted, foldName(candidate))
    if (!best || distance < best.distance) best = { name: candidate, distance }
  }
  // near: a slip of a few letters, scaled to the name's length (at most a third of it)
  return best && best.distance <= Math.max(2, Math.floor(wanted.length / 3)) ? best.name : null
}

function readSite(name: string, lookups: Lookups, errors: string[]): Site | undefined {
  if (!name) {
    errors.push('site: required')
    return undefined
  }
  const found = lookups.sitesByName.get(name.toLocaleLowerCase('en')) ?? []
  const suggestion = found.length ? null : suggestSiteName(name, [...lookups.sitesByName.values()].flat().filter(s => !s.archivedAt).map(s => s.name))
  if (!found.length) errors.push(`site: no site named “${name}”${suggestion ? `; did you mean “${suggestion}”?` : ''}`)
  else if (found.length > 1) errors.push(`site: more than one site is named “${name}”; rename one first`)
  else if (found[0]!.archivedAt) errors.push(`site: “${found[0]!.name}” is archived`)
  else return found[0]
  return undefined
}

function readAssignees(cell: string, lookups: Lookups, errors: string[]): number[] {
  const emails = [...new Set(cell.split(/[;,\s]+/).map(e => e.trim().toLowerCase()).filter(Boolean))]
  const ids: number[] = []
  for (const email of emails) {
    const person = lookups.peopleByEmail.get(email)
    if (!person) errors.push(`assignees: no person with e-mail ${email}`)
    else if (!person.active) errors.push(`assignees: ${email} is deactivated`)
    else ids.push(person.id)
  }
  return ids
}

function readLight(cell: string, site: Site | undefined, errors: string[]): Shift['light'] | undefined {
  const value = cell.toLowerCase()
  // a blank cell takes the site's default requirement, as the form does
  if (!value) return site?.defaultLight
  if ((LIGHT_REQUIREMENTS as readonly string[]).includes(value)) return value as Shift['light']
  errors.push(`light: must be daylight, civil or any, not “${cell}”`)
  return undefined
}

function readTimes(row: CsvRow, site: Site | undefined, errors: string[], notes: string[]) {
  const start = readImportTime(row.cells.get('start') ?? '', 'start', site?.timezone)
  const end = readImportTime(row.cells.get('end') ?? '', 'end', site?.timezone)
  for (const part of [start, end]) {
    if (part.error) errors.push(part.error)
    if (part.note) notes.push(part.note)
  }
  if (start.ms === undefined || end.ms === undefined) return {}
  if (!(end.ms > start.ms)) errors.push('end: must be after start')
  else if (end.ms - start.ms > MAX_SHIFT_MS) errors.push('end: a shift may last at most 7 days')
  return { startMs: start.ms, endMs: end.ms }
}

// A spreadsheet export guards cells starting with = + - @ with a leading apostrophe (so they are not
// run as formulas); the apostrophe is not part of the text.
function unguardCell(value: string): string {
  return value.replace(/^'(?=[=+\-@\t\r])/, '')
}

function readTextCells(row: CsvRow, errors: string[]) {
  const title = unguardCell(row.cells.get('title') ?? '')
  const notes = unguardCell(row.cells.get('notes') ?? '')
  if (!title) errors.push('title: required')
  else if (title.length > 200) errors.push('title: at most 200 characters')
  if (notes.length > 4000) errors.push('notes: at most 4000 characters')
  return { title, notes }
}

function parseShiftRow(row: CsvRow, lookups: Lookups): ParsedRow {
  const errors = [...row.errors]
  const timeNotes: string[] = []
  const site = readSite(row.cells.get('site') ?? '', lookups, errors)
  const { title, notes } = readTextCells(row, errors)
  const { startMs, endMs } = readTimes(row, site, errors, timeNotes)
  const light = readLight(row.cells.get('light') ?? '', site, errors)
  const assigneeIds = readAssignees(row.cells.get('assignees') ?? '', lookups, errors)
  const preview: ShiftImportRow = { row: row.row, ok: errors.length === 0, errors }
  if (preview.ok && site && light && startMs !== undefined && endMs !== undefined) {
    preview.shift = { siteId: site.id, siteName: site.name, title, start: formatZonedIso(startMs, site.timezone), end: formatZonedIso(endMs, site.timezone), light, assigneeIds, notes }
    preview.timeNotes = timeNotes
  }
  return { preview, site, startMs, endMs, idCell: row.cells.get('id') || undefined }
}

const ID_RE = /^\d{1,12}$/

/**
 * Rows with an `id` name a planned shift: the same site, title, times, light, people and notes is
 * `unchanged` (nothing is written); anything different is an `update` of that shift.
 */
function matchPlannedShifts(db: Reader, parsed: ParsedRow[]) {
  const ids = parsed.map(p => p.idCell).filter((v): v is string => Boolean(v))
  if (!ids.length) {
    for (const p of parsed) if (p.preview.shift) p.preview.action = 'create'
    return
  }
  const wanted = [...new Set(ids.filter(v => ID_RE.test(v)).map(Number))]
  const planned = new Map(wanted.length ? db.select().from(shifts).where(inArray(shifts.id, wanted)).all().map(r => [r.id, r]) : [])
  const crewOf = wanted.length ? loadAssignees(db, wanted) : new Map<number, { id: number }[]>()
  const seen = new Map<number, number>()
  for (const p of parsed) {
    if (!p.idCell) {
      if (p.preview.shift) p.preview.action = 'create'
      continue
    }
    const row = ID_RE.test(p.idCell) ? planned.get(Number(p.idCell)) : undefined
    if (!row) p.preview.errors.push(`id: no planned shift #${p.idCell} (leave id empty to add a new shift)`)
    else if (row.cancelledAt) p.preview.errors.push(`id: shift #${row.id} was cancelled`)
    else if (seen.has(row.id)) p.preview.errors.push(`id: shift #${row.id} is also on row ${seen.get(row.id)}`)
    if (p.preview.errors.length || !row) {
      rejectRow(p.preview)
      continue
    }
    seen.set(row.id, p.preview.row)
    p.preview.shiftId = row.id
    const shift = p.preview.shift
    if (!shift) continue
    const sameIds = [...shift.assigneeIds].sort((a, b) => a - b).join(',') === (crewOf.get(row.id) ?? []).map(a => a.id).sort((a, b) => a - b).join(',')
    const same = shift.siteId === row.siteId && shift.title === row.title && p.startMs === row.startAt.getTime() && p.endMs === row.endAt.getTime()
      && shift.light === row.light && shift.notes === row.notes && sameIds
    p.preview.action = same ? 'unchanged' : 'update'
  }
}

function duplicateKey(siteId: number, title: string, startMs: number, endMs: number) {
  return `${siteId}|${title.trim().toLocaleLowerCase('en')}|${startMs}|${endMs}`
}

// Same site, title, start and end as an earlier row, or as a shift already planned, is a duplicate.
function markDuplicates(db: Reader, parsed: ParsedRow[]) {
  const ready = parsed.filter(p => p.preview.shift)
  if (!ready.length) return
  const fromMs = ready.reduce((min, p) => Math.min(min, p.startMs!), Infinity)
  const toMs = ready.reduce((max, p) => Math.max(max, p.endMs!), -Infinity)
  const existing = new Map(db.select({ id: shifts.id, siteId: shifts.siteId, title: shifts.title, startAt: shifts.startAt, endAt: shifts.endAt }).from(shifts)
    .where(and(isNull(shifts.cancelledAt), inArray(shifts.siteId, [...new Set(ready.map(p => p.site!.id))]), lt(shifts.startAt, new Date(toMs + 1)), gt(shifts.endAt, new Date(fromMs - 1)))).all()
    .map(s => [duplicateKey(s.siteId, s.title, s.startAt.getTime(), s.endAt.getTime()), s.id]))
  const seen = new Map<string, number>()
  for (const p of ready) {
    const key = duplicateKey(p.site!.id, p.preview.shift!.title, p.startMs!, p.endMs!)
    const earlier = seen.get(key)
    const stored = existing.get(key)
    if (earlier !== undefined) p.preview.errors.push(`duplicate of row ${earlier} (same site, title, start and end)`)
    else if (stored !== undefined) p.preview.errors.push(`already planned: shift #${stored} has the same site, title, start and end`)
    else seen.set(key, p.preview.row)
    if (p.preview.errors.length) rejectRow(p.preview)
  }
}

function rejectRow(preview: ShiftImportRow) {
  preview.ok = false
  delete preview.shift
  delete preview.timeNotes
  delete preview.action
}

// Each row is a pseudo-shift with id −row, so rows of the same file are checked against each other too.
function fileNeighbours(ready: ParsedRow[]): NeighbourShift[] {
  return ready.flatMap(p => p.preview.shift!.assigneeIds.map(personId => ({
    shiftId: -p.preview.row,
    personId,
    startMs: p.startMs!,
    endMs: p.endMs!,
    title: p.preview.shift!.title,
    siteName: `${p.site!.name} (row ${p.preview.row} of this file)`
  })))
}

function checkReadyRows(db: Reader, parsed: ParsedRow[]) {
  const ready = parsed.filter(p => p.preview.ok && p.preview.shift)
  const candidates = ready.map(p => ({ shiftId: -p.preview.row, startMs: p.startMs!, endMs: p.endMs!, personIds: p.preview.shift!.assigneeIds }))
  const loaded = addConflictNeighbours(loadConflictContext(db, candidates), fileNeighbours(ready))
  ready.forEach((p, i) => {
    const shift = p.preview.shift!
    const check = checkShiftLight({ latitude: p.site!.latitude, longitude: p.site!.longitude, startMs: p.startMs!, endMs: p.endMs!, requirement: shift.light })
    p.preview.lightCheck = { requirement: check.requirement, minutesBelow: check.minutesBelow, flagged: check.flagged }
    p.preview.conflicts = checkConflictsWith(loaded, candidates[i]!).map(c => ({ ...c, otherShiftId: c.otherShiftId !== null && c.otherShiftId < 0 ? null : c.otherShiftId }))
  })
}

/** Validates a shift CSV row by row, with the light check and conflicts of every valid row; writes nothing. */
export function previewShiftImport(db: Reader, csv: string): ShiftImportPreview {
  const table = readCsvTable(csv, REQUIRED_COLUMNS, OPTIONAL_COLUMNS)
  if (table.errors.length) return { valid: false, rows: [], errors: table.errors }
  const lookups = loadLookups(db)
  const parsed = table.rows.map(row => parseShiftRow(row, lookups))
  matchPlannedShifts(db, parsed)
  markDuplicates(db, parsed.filter(p => p.preview.action !== 'update' && p.preview.action !== 'unchanged'))
  checkReadyRows(db, parsed)
  const rows = parsed.map(p => p.preview)
  return { valid: rows.every(r => r.ok), rows, errors: [] }
}

function insertImportedShifts(tx: Parameters<Parameters<AppDatabase['transaction']>[0]>[0], actorId: number, rows: ShiftImportRow[]) {
  const ids: number[] = []
  const links: { shiftId: number, personId: number }[] = []
  const siteById = new Map(tx.select().from(sites).all().map(s => [s.id, s]))
  for (const r of rows) {
    const shift = r.shift!
    const check = r.lightCheck!
    const startMs = Date.parse(shift.start)
    const endMs = Date.parse(shift.end)
    const site = siteById.get(shift.siteId)!
    const reviewReasons = assessShiftReview(tx, { site, window: { fromMs: startMs, toMs: endMs }, startMs, endMs, lightCheck: check, assigneeCount: shift.assigneeIds.length })
    const inserted = tx.insert(shifts).values({
      siteId: shift.siteId, title: shift.title, startAt: new Date(startMs), endAt: new Date(endMs),
      light: shift.light, notes: shift.notes, minutesBelow: check.minutesBelow, flagged: check.flagged,
      reviewReasons, reviewState: initialReviewState(reviewReasons.length > 0), createdBy: actorId
    }).returning({ id: shifts.id }).get()
    ids.push(inserted.id)
    for (const personId of shift.assigneeIds) links.push({ shiftId: inserted.id, personId })
  }
  for (let i = 0; i < links.length; i += INSERT_CHUNK) tx.insert(shiftAssignees).values(links.slice(i, i + INSERT_CHUNK)).run()
  return ids
}

/**
 * Imports every row of a shift CSV in one transaction, or nothing: the preview is re-run inside the
 * transaction (the database may have changed since it was shown) and any bad row refuses the file.
 */
export function importShiftsFromCsv(db: AppDatabase, actorId: number, csv: string) {
  const result = db.transaction((tx) => {
    const preview = previewShiftImport(tx, csv)
    if (!preview.valid) {
      const bad = preview.rows.filter(r => !r.ok).length
      const message = preview.errors[0] ?? `${bad} of ${preview.rows.length} rows have errors; nothing was imported`
      throw fieldError('csv', message, { data: { ...preview }, title: message })
    }
    const ids = insertImportedShifts(tx, actorId, preview.rows.filter(r => r.action === 'create'))
    // rows naming a planned shift change it as the form would (re-check, re-open a decided review);
    // better-sqlite3 runs updateShift's own transaction as a savepoint inside this one
    const updates = preview.rows.filter(r => r.action === 'update')
    for (const r of updates) {
      const s = r.shift!
      updateShift(db, { id: actorId }, r.shiftId!, { siteId: s.siteId, title: s.title, start: s.start, end: s.end, light: s.light, assigneeIds: s.assigneeIds, notes: s.notes })
    }
    const unchanged = preview.rows.filter(r => r.action === 'unchanged').length
    const flagged = preview.rows.filter(r => r.action === 'create' && r.lightCheck!.flagged).length
    recordAudit(tx, actorId, 'shift.import', 'shift', null, { created: ids.length, updated: updates.map(r => r.shiftId), unchanged, flagged, ids, notified: ids.length <= IMPORT_NOTICE_LIMIT })
    return { created: ids.length, updated: updates.length, unchanged, ids, notified: ids.length <= IMPORT_NOTICE_LIMIT }
  })
  if (result.notified) {
    for (const id of result.ids) announceShiftChange({ kind: 'created', shiftId: id, actorId, previousAssigneeIds: [], material: true })
  }
  return result
}
