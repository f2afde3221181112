import type { AppDatabase } from '../server/utils/db'
import { checkShiftLight } from '../server/core/light/check'
import { localDateOf } from '../server/core/time/zoned'
import { addDays } from '../shared/format'
import { people, sites } from '../server/db/schema'

// A synthetic load scenario (benchmarks only): 6 sites, 200 crew, a busy calendar week of 592 shifts
// (two people each) and other shifts before it: 1,408 over half a year (2,000 in all, a young
// database), or 99,408 over five years (100,000 in all, the same week in year five). A plannable
// roster: each day's shifts start between 05:00 and 20:00 UTC, and crew member k works only the
// day's slot k / 2, so nobody works twice a day and the same slot on the next day is 24 h later.
const CREW = 200
const SITES = [
  { name: 'Load site 78N', latitude: 78.22, longitude: 15.63, timezone: 'Arctic/Longyearbyen' },
  { name: 'Load site 69N', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
  { name: 'Load site 64N', latitude: 64.18, longitude: -51.72, timezone: 'America/Nuuk' },
  { name: 'Load site 62N', latitude: 62.45, longitude: -135.36, timezone: 'America/Whitehorse' },
  { name: 'Load site 60N', latitude: 60.39, longitude: 5.32, timezone: 'Europe/Oslo' },
  { name: 'Load site 78S', latitude: -77.85, longitude: 166.68, timezone: 'Antarctica/McMurdo' }
]
export const WEEK_SHIFTS = 592
const DAY_MS = 86_400_000
const QUARTER_MS = 900_000
const LIGHTS = ['daylight', 'civil', 'any'] as const

/** Fills an empty, migrated database; returns the figures the load run needs. */
export function seedLoadScenario(db: AppDatabase, passwordHash: string, now: number, options: { totalShifts?: number } = {}) {
  const total = options.totalShifts ?? 2_000
  const today = localDateOf(now, 'UTC')
  const weekStart = Date.parse(`${today}T00:00:00Z`)
  const personRows = db.insert(people).values(Array.from({ length: CREW + 4 }, (_, i) => ({
    name: `Load Person ${i + 1}`, email: `load${i + 1}@load.test`, role: i === 0 ? 'coordinator' as const : (i < 4 ? 'safety' as const : 'crew' as const), passwordHash
  }))).returning().all()
  const siteRows = db.insert(sites).values(SITES).returning().all()
  const sqlite = db.$client
  const insertShift = sqlite.prepare(`insert into shifts (site_id, title, start_at, end_at, light, minutes_below, flagged, review_state, created_at, updated_at)
    values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
  const insertAssignee = sqlite.prepare('insert into shift_assignees (shift_id, person_id) values (?, ?)')
  const ids: number[] = []
  let serial = 0
  // `count` shifts on the day starting at dayMs, in slots from 05:00 to 20:00 UTC
  const addDay = (dayMs: number, count: number) => {
    for (let slot = 0; slot < count; slot++) {
      const i = serial++
      const site = siteRows[i % siteRows.length]!
      const startMs = dayMs + 5 * 3_600_000 + Math.floor(slot * 15 * 3_600_000 / count / QUARTER_MS) * QUARTER_MS
      const endMs = startMs + (4 + (i % 5)) * 3_600_000
      const light = LIGHTS[i % 3]!
      const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: light })
      const id = Number(insertShift.run(site.id, `Load shift ${i + 1}`, startMs, endMs, light, check.minutesBelow, check.flagged ? 1 : 0, check.flagged ? 'pending' : 'not-needed', now, now).lastInsertRowid)
      insertAssignee.run(id, personRows[4 + ((slot * 2) % CREW)]!.id)
      insertAssignee.run(id, personRows[4 + ((slot * 2 + 1) % CREW)]!.id)
      ids.push(id)
    }
  }
  const others = total - WEEK_SHIFTS
  sqlite.transaction(() => {
    // the week: 592 shifts over its 7 days (85 or 84 a day)
    for (let d = 0; d < 7; d++) addDay(weekStart + d * DAY_MS, Math.floor((WEEK_SHIFTS * (d + 1)) / 7) - Math.floor((WEEK_SHIFTS * d) / 7))
    // the rest before it: five years for the large database, half a year for the young one
    const days = total > 10_000 ? 5 * 365 : 180
    // (ending a clear day before the week, so that the week holds the same shifts in both)
    for (let d = 0; d < days; d++) addDay(weekStart - (days - d + 1) * DAY_MS, Math.floor((others * (d + 1)) / days) - Math.floor((others * d) / days))
  })()
  return {
    shifts: total,
    people: personRows.length,
    sites: siteRows.length,
    coordinatorEmail: personRows[0]!.email,
    emails: personRows.map(p => p.email),
    siteNames: siteRows.map(s => s.name),
    weekFrom: today,
    weekTo: addDays(today, 7),
    monthFrom: today,
    monthTo: addDays(today, 30),
    contestedShiftIds: ids.slice(100, 105)
  }
}
