import { sql } from 'drizzle-orm'
import type { AppDatabase } from '../utils/db'
import { checkShiftLight } from '../core/light/check'
import { localDateOf, resolveLocalOrInstant } from '../core/time/zoned'
import { addDays } from '../../shared/format'
import { crewMembers, crews, people, reviews, shiftAssignees, shifts, sites, unavailability, type NewShift } from './schema'
import { nowMs } from '../core/time/clock'

// The demo scenario: an invented operator, Northwake Field Services, with invented sites at real
// coordinates and invented people on the .test domain. Demo only: no test relies on these numbers.
export const DEMO_PASSWORD = 'gloamline-demo'

const SITES = [
  { name: 'Kvitfjell Ice Camp', latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen', elevation: 40, defaultLight: 'civil', notes: 'Glacier-front survey camp. Polar bear watch required off camp.' },
  { name: 'Ravnvik Pipeline Yard', latitude: 69.6496, longitude: 18.9560, timezone: 'Europe/Oslo', elevation: 12, defaultLight: 'daylight', notes: 'Laydown yard and river crossing works.' },
  { name: 'Saqqaq Ridge Survey', latitude: 69.2198, longitude: -51.0986, timezone: 'America/Nuuk', elevation: 210, defaultLight: 'daylight', notes: 'Ridge line geophysics; helicopter access only.' },
  { name: 'Tamarack Creek Mine', latitude: 62.4540, longitude: -135.3570, timezone: 'America/Whitehorse', elevation: 780, defaultLight: 'civil', notes: 'Open pit and haul road; lit work areas by the plant.' },
  { name: 'Larsen Wharf Line Crew', latitude: 60.3913, longitude: 5.3221, timezone: 'Europe/Oslo', elevation: 5, defaultLight: 'daylight', notes: 'Coastal power line maintenance.' },
  { name: 'Cape Mawdsley Station', latitude: -77.8460, longitude: 166.6760, timezone: 'Antarctica/McMurdo', elevation: 24, defaultLight: 'any', notes: 'Summer field season, sea-ice route flagging.' }
] as const

const PEOPLE = [
  { name: 'Ingrid Halvorsen', email: 'coordinator@gloamline.test', role: 'coordinator' },
  { name: 'Tomas Reyes', email: 'safety@gloamline.test', role: 'safety' },
  { name: 'Aputsiaq Berthelsen', email: 'crew@gloamline.test', role: 'crew' },
  { name: 'Maren Solbakk', email: 'maren.solbakk@gloamline.test', role: 'coordinator' },
  { name: 'Dev Raman', email: 'dev.raman@gloamline.test', role: 'safety' },
  { name: 'Liv Aasen', email: 'liv.aasen@gloamline.test', role: 'crew' },
  { name: 'Kalle Niemi', email: 'kalle.niemi@gloamline.test', role: 'crew' },
  { name: 'Sofia Marchetti', email: 'sofia.marchetti@gloamline.test', role: 'crew' },
  { name: 'Jonas Eide', email: 'jonas.eide@gloamline.test', role: 'crew' },
  { name: 'Nora Tuktu', email: 'nora.tuktu@gloamline.test', role: 'crew' },
  { name: 'Owen McBride', email: 'owen.mcbride@gloamline.test', role: 'crew' },
  { name: 'Hanna Lindqvist', email: 'hanna.lindqvist@gloamline.test', role: 'crew' },
  { name: 'Pita Rangi', email: 'pita.rangi@gloamline.test', role: 'crew' },
  { name: 'Elias Brandt', email: 'elias.brandt@gloamline.test', role: 'crew' },
  { name: 'Mika Virtanen', email: 'mika.virtanen@gloamline.test', role: 'crew' },
  { name: 'Greta Holm', email: 'greta.holm@gloamline.test', role: 'crew' },
  { name: 'Siri Dahl', email: 'siri.dahl@gloamline.test', role: 'crew' },
  { name: 'Tane Walker', email: 'tane.walker@gloamline.test', role: 'crew' },
  { name: 'Ana Kealoha', email: 'ana.kealoha@gloamline.test', role: 'crew' },
  { name: 'Rolf Strand', email: 'rolf.strand@gloamline.test', role: 'crew' },
  { name: 'Aino Korhonen', email: 'aino.korhonen@gloamline.test', role: 'crew' }
] as const

const CREWS = [
  { name: 'Rime crew', members: ['crew@gloamline.test', 'jonas.eide@gloamline.test', 'liv.aasen@gloamline.test', 'kalle.niemi@gloamline.test'] },
  { name: 'Lantern crew', members: ['sofia.marchetti@gloamline.test', 'nora.tuktu@gloamline.test', 'owen.mcbride@gloamline.test', 'hanna.lindqvist@gloamline.test'] },
  { name: 'Bearing crew', members: ['pita.rangi@gloamline.test', 'elias.brandt@gloamline.test', 'mika.virtanen@gloamline.test', 'greta.holm@gloamline.test'] }
]

interface Pattern { hour: number, hours: number, title: string, light: 'daylight' | 'civil' | 'any', people: string[], days: number[] }
const MON_SAT = [1, 2, 3, 4, 5, 6]
const MON_FRI = [1, 2, 3, 4, 5]
const EVERY_DAY = [0, 1, 2, 3, 4, 5, 6]
const SUNDAY = [0]

// per site: the work pattern (local start hour, length, task, requirement, the same people each
// working day, so nobody is planned twice at once or without a night's rest). Seeded on any date, every
// day of the week holds both flagged and clear work, and the crew demo account works every day:
// - the ice camp and the far-south station work every day of their season, so Sundays have people too;
// - clear every day: 'any' light never flags (weather mast Mon–Sat, camp systems round on Sundays);
// - flagged every day: the night outage switching at Larsen Wharf (60.4° N) needs daylight, and the
//   sun is below the horizon there at local midnight all year (it never rises above 0° at midnight
//   south of the Arctic Circle).
const PATTERNS: Record<string, Pattern[]> = {
  'Kvitfjell Ice Camp': [
    { hour: 9, hours: 4, title: 'Snow-machine route check', light: 'civil', people: ['crew@gloamline.test', 'jonas.eide@gloamline.test'], days: EVERY_DAY },
    { hour: 13, hours: 3, title: 'Weather mast service', light: 'any', people: ['liv.aasen@gloamline.test', 'kalle.niemi@gloamline.test'], days: MON_SAT },
    { hour: 13, hours: 3, title: 'Camp systems round', light: 'any', people: ['liv.aasen@gloamline.test'], days: SUNDAY }
  ],
  'Ravnvik Pipeline Yard': [
    { hour: 8, hours: 6, title: 'Pipe stringing', light: 'daylight', people: ['sofia.marchetti@gloamline.test', 'nora.tuktu@gloamline.test'], days: MON_FRI },
    { hour: 15, hours: 3, title: 'Crossing inspection', light: 'civil', people: ['owen.mcbride@gloamline.test'], days: [2, 4] }
  ],
  'Saqqaq Ridge Survey': [
    { hour: 10, hours: 4, title: 'Magnetometer traverse', light: 'daylight', people: ['hanna.lindqvist@gloamline.test'], days: [1, 3, 5] }
  ],
  'Tamarack Creek Mine': [
    { hour: 7, hours: 10, title: 'Haul road grading', light: 'civil', people: ['pita.rangi@gloamline.test', 'elias.brandt@gloamline.test'], days: MON_FRI },
    { hour: 19, hours: 8, title: 'Pit lighting maintenance', light: 'any', people: ['mika.virtanen@gloamline.test', 'greta.holm@gloamline.test'], days: [1, 2, 3, 4] }
  ],
  'Larsen Wharf Line Crew': [
    { hour: 9, hours: 5, title: 'Line patrol', light: 'daylight', people: ['siri.dahl@gloamline.test'], days: MON_FRI },
    { hour: 22, hours: 4, title: 'Outage switching', light: 'daylight', people: ['rolf.strand@gloamline.test'], days: [0, 1, 2, 3] },
    { hour: 22, hours: 4, title: 'Outage switching', light: 'daylight', people: ['aino.korhonen@gloamline.test'], days: [4, 5, 6] }
  ],
  'Cape Mawdsley Station': [
    { hour: 8, hours: 9, title: 'Sea-ice route flagging', light: 'daylight', people: ['tane.walker@gloamline.test', 'ana.kealoha@gloamline.test'], days: EVERY_DAY }
  ]
}

/** True when the database holds no people yet: seeding never touches a database with data. */
export function isDatabaseEmpty(db: AppDatabase) {
  const row = db.select({ n: sql<number>`count(*)` }).from(people).get()
  return (row?.n ?? 0) === 0
}

/** Seeds the demo scenario around `now` in one transaction; returns false when there was data already. */
export function seedDemoScenario(db: AppDatabase, passwordHash: string, now = nowMs()): boolean {
  if (!isDatabaseEmpty(db)) return false
  db.transaction((tx) => {
    const personRows = tx.insert(people).values(PEOPLE.map(p => ({ ...p, passwordHash }))).returning().all()
    const idByEmail = new Map(personRows.map(p => [p.email, p.id]))
    const siteRows = tx.insert(sites).values(SITES.map(s => ({ ...s }))).returning().all()
    const crewRows = tx.insert(crews).values(CREWS.map(c => ({ name: c.name }))).returning().all()
    const crewPeople = CREWS.map(c => c.members.map(email => idByEmail.get(email)!))
    crewRows.forEach((crew, i) => tx.insert(crewMembers).values(crewPeople[i]!.map(personId => ({ crewId: crew.id, personId }))).run())
    const creator = idByEmail.get('coordinator@gloamline.test')!
    const safetyId = idByEmail.get('safety@gloamline.test')!
    for (const site of siteRows) {
      const today = localDateOf(now, site.timezone)
      for (let offset = -14; offset <= 21; offset++) {
        const date = addDays(today, offset)
        const weekday = new Date(`${date}T12:00:00Z`).getUTCDay()
        for (const { hour, hours, title, light, people: emails, days } of PATTERNS[site.name]!) {
          if (!days.includes(weekday)) continue
          const members = emails.map(email => idByEmail.get(email)!)
          const startMs = resolveLocalOrInstant(`${date}T${String(hour).padStart(2, '0')}:00`, site.timezone).ms
          const endMs = startMs + hours * 3_600_000
          const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: light })
          const values: NewShift = {
            siteId: site.id, title, light, startAt: new Date(startMs), endAt: new Date(endMs),
            minutesBelow: check.minutesBelow, flagged: check.flagged,
            reviewState: check.flagged ? 'pending' : 'not-needed', createdBy: creator
          }
          // past dark-hour work was reviewed: approved with lighting and a second person
          if (check.flagged && offset < 0) values.reviewState = 'approved'
          const row = tx.insert(shifts).values(values).returning({ id: shifts.id }).get()
          if (values.reviewState === 'approved') {
            tx.insert(reviews).values({ shiftId: row.id, reviewerId: safetyId, decision: 'approved', mitigations: ['portable-lighting', 'two-person-minimum'], note: 'Lit route and buddy system as briefed.', shiftVersion: 1 }).run()
          }
          tx.insert(shiftAssignees).values(members.map(personId => ({ shiftId: row.id, personId }))).run()
        }
      }
    }
    tx.insert(unavailability).values([
      { personId: idByEmail.get('kalle.niemi@gloamline.test')!, startAt: new Date(now + 2 * 86_400_000), endAt: new Date(now + 6 * 86_400_000), reason: 'Leave' },
      { personId: idByEmail.get('owen.mcbride@gloamline.test')!, startAt: new Date(now + 9 * 86_400_000), endAt: new Date(now + 10 * 86_400_000), reason: 'Travel day' }
    ]).run()
  })
  return true
}
