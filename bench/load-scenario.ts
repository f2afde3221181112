import type { AppDatabase } from '../server/utils/db'
import { checkShiftLight } from '../server/core/light/check'
import { localDateOf } from '../server/core/time/zoned'
import { addDays } from '../shared/format'
import { people, shiftAssignees, shifts, sites } from '../server/db/schema'

// A synthetic load scenario (benchmarks only): 6 sites, 50 people, 2,000 shifts over half a year
// (about 78 a week across the sites, two people each: a busy but plannable roster).
const SITES = [
  { name: 'Load site 78N', latitude: 78.22, longitude: 15.63, timezone: 'Arctic/Longyearbyen' },
  { name: 'Load site 69N', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' },
  { name: 'Load site 64N', latitude: 64.18, longitude: -51.72, timezone: 'America/Nuuk' },
  { name: 'Load site 62N', latitude: 62.45, longitude: -135.36, timezone: 'America/Whitehorse' },
  { name: 'Load site 60N', latitude: 60.39, longitude: 5.32, timezone: 'Europe/Oslo' },
  { name: 'Load site 78S', latitude: -77.85, longitude: 166.68, timezone: 'Antarctica/McMurdo' }
]

/** Fills an empty, migrated database; returns the figures the load run needs. */
export function seedLoadScenario(db: AppDatabase, passwordHash: string, now: number) {
  return db.transaction((tx) => {
    const personRows = tx.insert(people).values(Array.from({ length: 50 }, (_, i) => ({
      name: `Load Person ${i + 1}`, email: `load${i + 1}@load.test`, role: i === 0 ? 'coordinator' as const : (i < 4 ? 'safety' as const : 'crew' as const), passwordHash
    }))).returning().all()
    const siteRows = tx.insert(sites).values(SITES).returning().all()
    const ids: number[] = []
    const startDay = now - 90 * 86_400_000
    const step = (180 * 86_400_000) / 2000
    for (let i = 0; i < 2000; i++) {
      const site = siteRows[i % siteRows.length]!
      const startMs = startDay + Math.round(i * step / 900_000) * 900_000
      const endMs = startMs + (4 + (i % 5)) * 3_600_000
      const light = (['daylight', 'civil', 'any'] as const)[i % 3]!
      const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: light })
      const row = tx.insert(shifts).values({ siteId: site.id, title: `Load shift ${i + 1}`, startAt: new Date(startMs), endAt: new Date(endMs), light, minutesBelow: check.minutesBelow, flagged: check.flagged, reviewState: check.flagged ? 'pending' : 'not-needed' }).returning({ id: shifts.id }).get()
      tx.insert(shiftAssignees).values([0, 1].map(k => ({ shiftId: row.id, personId: personRows[4 + ((i * 2 + k) % 46)]!.id }))).run()
      ids.push(row.id)
    }
    const today = localDateOf(now, 'UTC')
    return {
      shifts: ids.length,
      people: personRows.length,
      sites: siteRows.length,
      coordinatorEmail: personRows[0]!.email,
      weekFrom: today,
      weekTo: addDays(today, 7),
      monthFrom: today,
      monthTo: addDays(today, 30),
      contestedShiftIds: ids.slice(1000, 1005)
    }
  })
}
