import { people } from '../../db/schema'
import { PersonBodySchema } from '../../../shared/schemas/person'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, PersonBodySchema)
  if (findPersonByEmail(body.email)) {
    throw conflict('Someone with this e-mail already exists', { issues: [{ field: 'email', message: 'already in use' }] })
  }
  const db = useDB()
  const linkOptions = { baseUrl: resolvePublicBaseUrl(event)!, secret: readSessionSecret() }
  // the new person gets a one-time link to choose a password, written with the person in one transaction
  const { person, messageId } = db.transaction((tx) => {
    const row = tx.insert(people).values(body).returning().get()
    recordAudit(tx, actor.id, 'person.create', 'person', row.id, { email: row.email, role: row.role })
    return { person: row, messageId: invitePeopleAdded(tx, actor, [row.id], linkOptions)[0]! }
  })
  const delivery = await deliverOutboxMessage(db, messageId)
  setResponseStatus(event, 201)
  return { id: person.id, name: person.name, email: person.email, role: person.role, active: person.active, pending: true, mail: { messageId, status: delivery.status === 'sent' ? 'sent' : 'queued-for-retry' } }
})
