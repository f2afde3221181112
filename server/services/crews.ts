import { asc, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { crewMembers, crews, people } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { conflict, fieldError, notFound } from '../utils/errors'
import { CONTROL_CHARACTERS_MESSAGE, hasControlCharacters } from '../utils/validation'

export const CrewNameSchema = z.string({ error: 'expected a crew name' }).trim().min(1, 'required').max(80, 'at most 80 characters').refine(value => !hasControlCharacters(value), CONTROL_CHARACTERS_MESSAGE)
const MemberIdsSchema = z.array(z.number().int().positive(), { error: 'expected a list of person ids' }).max(500)

export const CrewBodySchema = z.object({ name: CrewNameSchema, memberIds: MemberIdsSchema.default([]) })
export const CrewPatchSchema = z.object({ name: CrewNameSchema.optional(), memberIds: MemberIdsSchema.optional() })

export interface CrewView {
  id: number
  name: string
  members: { id: number, name: string, role: 'coordinator' | 'safety' | 'crew' }[]
}

type Reader = Pick<AppDatabase, 'select'>
type Tx = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]

/** Every crew with its members, by name; a person may be in several crews. */
export function listCrews(db: Reader, ids?: number[]): CrewView[] {
  const rows = db.select().from(crews).where(ids ? inArray(crews.id, ids) : undefined).orderBy(asc(crews.name)).all()
  if (!rows.length) return []
  const members = db.select({ crewId: crewMembers.crewId, id: people.id, name: people.name, role: people.role })
    .from(crewMembers).innerJoin(people, eq(people.id, crewMembers.personId))
    .where(inArray(crewMembers.crewId, rows.map(r => r.id))).orderBy(asc(people.name)).all()
  return rows.map(crew => ({
    id: crew.id,
    name: crew.name,
    members: members.filter(m => m.crewId === crew.id).map(m => ({ id: m.id, name: m.name, role: m.role }))
  }))
}

/** One crew with its members, or a 404. */
export function requireCrewView(db: Reader, id: number): CrewView {
  const found = listCrews(db, [id])[0]
  if (!found) throw notFound('Crew')
  return found
}

// Crew names are unique regardless of case, so "Rime crew" and "rime crew" cannot both exist.
function requireFreeCrewName(db: Reader, name: string, exceptId?: number) {
  // compared in JS: SQLite's lower() only folds ASCII, and crew names may be Norwegian or Greenlandic
  const key = name.toLocaleLowerCase('en')
  const clash = db.select({ id: crews.id, name: crews.name }).from(crews).all()
    .find(row => row.id !== exceptId && row.name.toLocaleLowerCase('en') === key)
  if (clash) throw conflict(`A crew named “${name}” already exists`, { issues: [{ field: 'name', message: 'already in use' }] })
}

function requireMembers(db: Reader, ids: number[]) {
  const unique = [...new Set(ids)]
  if (!unique.length) return unique
  const found = new Set(db.select({ id: people.id }).from(people).where(inArray(people.id, unique)).all().map(p => p.id))
  const missing = unique.filter(id => !found.has(id))
  if (missing.length) throw fieldError('memberIds', `no person with id ${missing.join(', ')}`)
  return unique
}

function replaceMembers(tx: Tx, crewId: number, memberIds: number[]) {
  tx.delete(crewMembers).where(eq(crewMembers.crewId, crewId)).run()
  if (memberIds.length) tx.insert(crewMembers).values(memberIds.map(personId => ({ crewId, personId }))).run()
}

/** Creates a crew with its members and an audit entry in one transaction. */
export function createCrew(db: AppDatabase, actorId: number, input: z.infer<typeof CrewBodySchema>): CrewView {
  const id = db.transaction((tx) => {
    requireFreeCrewName(tx, input.name)
    const memberIds = requireMembers(tx, input.memberIds)
    const row = tx.insert(crews).values({ name: input.name }).returning().get()
    replaceMembers(tx, row.id, memberIds)
    recordAudit(tx, actorId, 'crew.create', 'crew', row.id, { name: row.name, memberIds })
    return row.id
  })
  return requireCrewView(db, id)
}

/** Renames a crew and/or replaces its members. */
export function updateCrew(db: AppDatabase, actorId: number, id: number, patch: z.infer<typeof CrewPatchSchema>): CrewView {
  db.transaction((tx) => {
    const before = requireCrewView(tx, id)
    if (patch.name !== undefined) {
      requireFreeCrewName(tx, patch.name, id)
      tx.update(crews).set({ name: patch.name }).where(eq(crews.id, id)).run()
    }
    const memberIds = patch.memberIds ? requireMembers(tx, patch.memberIds) : undefined
    if (memberIds) replaceMembers(tx, id, memberIds)
    recordAudit(tx, actorId, 'crew.update', 'crew', id, { before: { name: before.name, memberIds: before.members.map(m => m.id) }, patch })
  })
  return requireCrewView(db, id)
}

/** Deletes a crew; its people and their shifts stay (shifts name people, not crews). */
export function deleteCrew(db: AppDatabase, actorId: number, id: number) {
  db.transaction((tx) => {
    const before = requireCrewView(tx, id)
    tx.delete(crews).where(eq(crews.id, id)).run()
    recordAudit(tx, actorId, 'crew.delete', 'crew', id, { name: before.name, memberIds: before.members.map(m => m.id) })
  })
  return { id, deleted: true }
}
