import { eq } from 'drizzle-orm'
import { people } from '../../db/schema'
import { IdParamsSchema } from '../../utils/validation'
import { PersonPatchSchema } from '../../../shared/schemas/person'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const changes = await readBodyAs(event, PersonPatchSchema)
  const before = findPersonPublic(id)
  if (!before) throw notFound('Person')
  if (id === actor.id && (changes.active === false || (changes.role && changes.role !== 'coordinator'))) {
    throw fieldError(changes.active === false ? 'active' : 'role', 'not on your own account', { title: 'Invalid role: you cannot demote or deactivate yourself' })
  }
  useDB().transaction((tx) => {
    tx.update(people).set({ ...changes, updatedAt: nowDate() }).where(eq(people.id, id)).run()
    // deactivation ends every session of that person at once (and they stay ended on reactivation)
    if (changes.active === false) endPersonSessions(tx, id)
    recordAudit(tx, actor.id, 'person.update', 'person', id, { before, changes })
  })
  return findPersonPublic(id)
})
