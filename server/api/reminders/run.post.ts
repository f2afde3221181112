import { z } from 'zod'
import { LocalDateSchema } from '../../utils/validation'

const QuerySchema = z.object({ date: LocalDateSchema })

// Sends now the reminders for shifts on a local date (each site in its own zone). A second run for
// the same date finds every message in the outbox and sends nothing new.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { date } = readQueryAs(event, QuerySchema)
  // any date is accepted, a past one too (docs/api.md): the coordinator may resend a missed evening
  const db = useDB()
  const result = await runRemindersForDate(db, date, { baseUrl: resolvePublicBaseUrl(event) })
  recordAudit(db, actor.id, 'reminders.run', 'reminder', null, { date, ...result })
  return result
})
