import { z } from 'zod'

const QuerySchema = z.object({
  status: z.enum(['queued', 'sent', 'failed'], { error: 'must be queued, sent or failed' }).optional(),
  kind: z.string().trim().min(1).max(40).regex(/^[a-z-]+$/, 'letters and dashes only').optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  before: z.coerce.number().int().positive().optional()
})

// The outbox, newest first, without bodies: what was sent, what waits, what failed and why.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const query = readQueryAs(event, QuerySchema)
  return listOutboxMessages(useDB(), { status: query.status, kind: query.kind, limit: query.limit, beforeId: query.before })
})
