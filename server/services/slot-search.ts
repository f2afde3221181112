// POST /api/slots/search as a service: validates the request against the site, gathers the people,
// their other shifts, blocked spans and the work rules from the database, and runs the pure slot
// finder. Explicit imports (no auto-imports), so the benchmark can call it on a fresh database.
import { and, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { crewMembers, crews, people } from '../db/schema'
import { SLOT_RANKS, type SlotSearchResult } from '../../shared/outlook'
import type { AppDatabase } from '../utils/db'
import { fieldError } from '../utils/errors'
import type { ConflictContext } from '../core/planning/conflicts'
import { loadConflictContext } from './conflict-context'
import { computeLightDaysMs } from '../core/light/index'
import { formatInstantInZone, shiftLocalDate } from '../core/time/zone-table'
import { findSlots, MAX_SLOTS_PER_DAY, type SlotPerson } from '../core/planning/slot-finder'
import { requireAssignees, requireSiteForShift } from './shifts'
import { LightRequirementSchema, LocalDateSchema, TravelMinutesSchema } from '../utils/validation'
import { loadWorkRules } from './work-rules'
import { nowMs as clockNowMs } from '../core/time/clock'

/** Longest window one search may cover, in local days (from and to inclusive). */
export const MAX_SLOT_WINDOW_DAYS = 90
const MAX_TASK_MINUTES = 7 * 24 * 60

function countWindowDays(from: string, to: string) {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000) + 1
}

function isRealDate(date: string) {
  const ms = Date.parse(`${date}T00:00:00Z`)
  return /^\d{4}-\d{2}-\d{2}$/.test(date) && !Number.isNaN(ms) && new Date(ms).toISOString().slice(0, 10) === date
}

export const SlotSearchBodySchema = z.object({
  siteId: z.number({ error: 'expected a site id' }).int().positive(),
  durationMinutes: z.number({ error: 'expected the task length in minutes' }).int('must be whole minutes')
    .min(15, 'must be at least 15 minutes').max(MAX_TASK_MINUTES, 'must be at most 7 days'),
  light: LightRequirementSchema,
  // local dates in the site's zone; `to` is inclusive: from=2027-01-11, to=2027-01-17 searches seven days
  from: LocalDateSchema,
  to: LocalDateSchema,
  assigneeIds: z.array(z.number().int().positive(), { error: 'expected a list of person ids' }).max(200).optional(),
  crewId: z.number({ error: 'expected a crew id' }).int().positive().optional(),
  headcount: z.number({ error: 'expected a number of people' }).int().min(1, 'must be at least 1').max(200).optional(),
  rank: z.enum(SLOT_RANKS, { error: 'must be earliest or margin' }).default('earliest'),
  perDay: z.number({ error: 'expected a number of slots' }).int().min(1).max(MAX_SLOTS_PER_DAY, `must be at most ${MAX_SLOTS_PER_DAY}`).default(1),
  // each way; absent: the site's travelMinutes. Slots are time on site; the whole outing is in the light.
  travelMinutes: TravelMinutesSchema.optional()
}).superRefine((body, ctx) => {
  if (!body.assigneeIds?.length && body.crewId === undefined) {
    ctx.addIssue({ code: 'custom', path: ['assigneeIds'], message: 'give at least one person (assigneeIds) or a crew (crewId)' })
  }
  // zod still runs this when a date failed its own check: compare only real dates
  if (!isRealDate(body.from) || !isRealDate(body.to)) return
  if (body.to < body.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must not be before from' })
  else if (countWindowDays(body.from, body.to) > MAX_SLOT_WINDOW_DAYS) {
    ctx.addIssue({ code: 'custom', path: ['to'], message: `the window may span at most ${MAX_SLOT_WINDOW_DAYS} days` })
  }
})
export type SlotSearchBody = z.infer<typeof SlotSearchBodySchema>

// The people a search is for: the listed ones, the crew's active members, or both (listed first).
function gatherPeople(db: AppDatabase, body: SlotSearchBody): SlotPerson[] {
  const ids = body.assigneeIds?.length ? requireAssignees(db, body.assigneeIds) : []
  if (body.crewId !== undefined) {
    const crew = db.select({ id: crews.id }).from(crews).where(eq(crews.id, body.crewId)).get()
    if (!crew) throw fieldError('crewId', `no crew with id ${body.crewId}`)
    const members = db.select({ id: crewMembers.personId }).from(crewMembers)
      .innerJoin(people, eq(people.id, crewMembers.personId))
      .where(and(eq(crewMembers.crewId, body.crewId), eq(people.active, true))).all()
    for (const m of members) if (!ids.includes(m.id)) ids.push(m.id)
    if (!ids.length) throw fieldError('crewId', 'this crew has no active members')
  }
  const rows = db.select({ id: people.id, name: people.name }).from(people).where(inArray(people.id, ids)).all()
  const names = new Map(rows.map(r => [r.id, r.name]))
  return ids.map(id => ({ id, name: names.get(id) ?? `Person #${id}` }))
}

// The flat context the pure finder takes, from the planning module's loader.
function loadSlotContext(db: AppDatabase, personIds: number[], fromMs: number, toMs: number, rules: ReturnType<typeof loadWorkRules>): ConflictContext {
  const loaded = loadConflictContext(db, [{ startMs: fromMs, endMs: toMs, personIds }], rules)
  return {
    otherShifts: [...loaded.byPerson.values()].flat(),
    unavailable: [...loaded.blockedByPerson.values()].flat(),
    personNames: loaded.personNames
  }
}

/** Runs a slot search for a validated body; `nowMs` keeps slots out of the past. */
export function searchSlots(db: AppDatabase, body: SlotSearchBody, nowMs = clockNowMs()): SlotSearchResult {
  const site = requireSiteForShift(db, body.siteId)
  const place = { latitude: site.latitude, longitude: site.longitude, timezone: site.timezone }
  const travelMinutes = body.travelMinutes ?? site.travelMinutes
  // A slot that starts on the last day may run past its midnight, and its trip out may begin the day
  // before the first: add the days the outing can reach.
  const tail = Math.ceil((body.durationMinutes + travelMinutes) / 1440)
  const head = Math.ceil(travelMinutes / 1440)
  const days = computeLightDaysMs({ ...place, from: shiftLocalDate(body.from, -head), to: shiftLocalDate(body.to, tail) })
  const windowDays = days.filter(d => d.date >= body.from && d.date <= body.to)
  const windowMinutes = (windowDays[windowDays.length - 1]!.endMs - windowDays[0]!.startMs) / 60_000
  if (body.durationMinutes > windowMinutes) throw fieldError('durationMinutes', `a ${body.durationMinutes}-minute task is longer than the window from ${body.from} to ${body.to}`)
  const pool = gatherPeople(db, body)
  if (body.headcount !== undefined && body.headcount > pool.length) throw fieldError('headcount', `only ${pool.length} people were given`)
  const rules = loadWorkRules(db)
  const context = loadSlotContext(db, pool.map(p => p.id), days[0]!.startMs, days[days.length - 1]!.endMs, rules)
  const outcome = findSlots({
    days, from: body.from, to: body.to, durationMinutes: body.durationMinutes, requirement: body.light,
    people: pool, headcount: body.headcount, context, rules, rank: body.rank, perDay: body.perDay, notBeforeMs: nowMs, travelMinutes
  })
  const nameOf = new Map(pool.map(p => [p.id, p.name]))
  return {
    siteId: site.id, timezone: site.timezone, requirement: body.light, rank: body.rank, from: body.from, to: body.to,
    slots: outcome.slots.map(s => ({
      start: formatInstantInZone(s.startMs, site.timezone),
      end: formatInstantInZone(s.endMs, site.timezone),
      date: s.date,
      durationMinutes: body.durationMinutes,
      lightBeforeMinutes: s.lightBeforeMinutes,
      lightAfterMinutes: s.lightAfterMinutes,
      assigneeIds: s.assigneeIds,
      assignees: s.assigneeIds.map(id => ({ id, name: nameOf.get(id)! }))
    })),
    reason: outcome.reason,
    reasonCode: outcome.reasonCode,
    daysWithSlots: outcome.daysWithSlots,
    daysSearched: outcome.daysSearched,
    travelMinutes,
    rules
  }
}
