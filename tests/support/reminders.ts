// Who should get an evening-before reminder for a date, read straight from the tables with plain SQL
// (not through the server's code): people assigned to a shift starting that local day at any site.
import Database from 'better-sqlite3'
import { fromZonedTime } from 'date-fns-tz'
import { addCalendarDays } from './clock'

function localMidnight(date: string, timezone: string) {
  return fromZonedTime(`${date}T00:00:00`, timezone).getTime()
}

/** E-mail → number of that person's shifts starting on `date` (each site's local day). */
export function expectedReminderRecipients(databasePath: string, date: string): Map<string, number> {
  const db = new Database(databasePath, { readonly: true })
  const out = new Map<string, number>()
  try {
    for (const site of db.prepare('select id, timezone from sites').all() as { id: number, timezone: string }[]) {
      const rows = db.prepare(`select p.email as email, count(*) as n from shifts s join shift_assignees a on a.shift_id = s.id join people p on p.id = a.person_id
        where s.site_id = ? and s.cancelled_at is null and s.start_at >= ? and s.start_at < ? and p.active = 1 and p.reminders_enabled = 1 group by p.email`)
        .all(site.id, localMidnight(date, site.timezone), localMidnight(addCalendarDays(date, 1), site.timezone)) as { email: string, n: number }[]
      for (const r of rows) out.set(r.email, (out.get(r.email) ?? 0) + r.n)
    }
  } finally {
    db.close()
  }
  return out
}

/** How many times each address received a message. */
export function countPerRecipient(messages: { to: string[] }[]): Map<string, number> {
  const out = new Map<string, number>()
  for (const m of messages) for (const to of m.to) out.set(to, (out.get(to) ?? 0) + 1)
  return out
}
