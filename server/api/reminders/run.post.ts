import { z } from 'zod'
import { addDays } from '../../../shared/format'
import { LocalDateSchema } from '../../utils/validation'

const QuerySchema = z.object({ date: LocalDateSchema })

// Sends now the reminders for shifts on a local date (each site in its own zone). A second run for
// the same date finds every message in the outbox and sends nothing new.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { date } = readQueryAs(event, QuerySchema)
  // a day before yesterday (UTC) is over in every zone: a reminder for it helps nobody
  if (date < addDays(new Date().toISOString().slice(0, 10), -1)) {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'Invalid date: that day is over; reminders go out for today or later', data: { issues: [{ field: 'date', message: 'in the past' }] } })
  }
  const db = useDB()
  const result = await runRemindersForDate(db, date, { baseUrl: resolvePublicBaseUrl(event) })
  recordAudit(db, actor.id, 'reminders.run', 'reminder', null, { date, ...result })
  return result
})
