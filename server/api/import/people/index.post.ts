import { ImportBodySchema } from '../../../core/planning/csv'
// All rows or none: a file with any bad row answers 400 with the preview and writes nothing.
// Everyone added gets a one-time link to choose a password; the mails go out after the reply.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { csv } = await readBodyAs(event, ImportBodySchema)
  const db = useDB()
  const linkOptions = { baseUrl: resolvePublicBaseUrl(event)!, secret: readSessionSecret() }
  const { messageIds, ...result } = importPeopleFromCsv(db, actor.id, csv, (tx, ids) => invitePeopleAdded(tx, actor, ids, linkOptions))
  const sending = (async () => {
    for (const id of messageIds) await deliverOutboxMessage(db, id).catch(() => undefined)
  })()
  event.waitUntil?.(sending)
  setResponseStatus(event, 201)
  return { ...result, invited: messageIds.length }
})
