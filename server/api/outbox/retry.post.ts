import { z } from 'zod'

const BodySchema = z.object({
  ids: z.array(z.number().int().positive(), { error: 'expected a list of message ids' }).max(500).optional()
}).strict()

// Retries failed messages now, ignoring the back-off: all of them, or the ids given.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { ids } = await readBodyAs(event, BodySchema)
  const db = useDB()
  const outcomes = await retryFailedOutboxMessages(db, ids)
  const result = {
    retried: outcomes.filter(o => o.status !== 'skipped').length,
    sent: outcomes.filter(o => o.status === 'sent').length,
    failed: outcomes.filter(o => o.status === 'failed').length
  }
  recordAudit(db, actor.id, 'outbox.retry', 'message', null, { ids: ids ?? 'all-failed', ...result })
  return result
})
