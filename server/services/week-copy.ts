// Copy a week: every live shift of one site in a week, repeated in the weeks after it on the same
// wall-clock times (a week whose shifts are too irregular for one rotation). Each copy is an ordinary
// shift, judged as the shift service judges one (light over the outing, review reasons), written in
// one transaction with one audit entry.
import { and, asc, eq, gte, inArray, isNull, lt } from 'drizzle-orm'
import { z } from 'zod'
import type { User } from '#auth-utils'
import { shiftAssignees, shifts } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { LocalDateSchema } from '../utils/validation'
import { invalidInput } from '../utils/errors'
import { addDays } from '../../shared/format'
import { formatZonedIso, localMidnightMs } from '../core/time/zoned'
import { resolveRotationTime } from '../core/planning/rotation'
import { requireSiteForShift } from './shifts'
import { initialReviewState } from './shift-writes'
import { recordAudit } from './audit'
import { announceShiftChange } from './shift-notices'
import { judgeSiteShifts } from './rotations'

export const MAX_COPY_WEEKS = 12

export const WeekCopyBodySchema = z.object({
  siteId: z.number({ error: 'expected a site id' }).int().positive(),
  weekStart: LocalDateSchema,
  weeks: z.number({ error: 'expected a number of weeks' }).int('must be whole weeks').min(1, 'copy into at least 1 week').max(MAX_COPY_WEEKS, `at most ${MAX_COPY_WEEKS} weeks`)
})
export type WeekCopyInput = z.output<typeof WeekCopyBodySchema>

function dayGap(a: string, b: string) {
  return Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000)
}

/** Copies a site's week into the following weeks; returns the new shifts' ids. */
export function copySiteWeek(db: AppDatabase, actor: Pick<User, 'id'>, input: WeekCopyInput) {
  const result = db.transaction((tx) => {
    const site = requireSiteForShift(tx, input.siteId)
    const source = tx.select().from(shifts).where(and(
      eq(shifts.siteId, site.id), isNull(shifts.cancelledAt),
      gte(shifts.startAt, new Date(localMidnightMs(input.weekStart, site.timezone))),
      lt(shifts.startAt, new Date(localMidnightMs(addDays(input.weekStart, 7), site.timezone)))
    )).orderBy(asc(shifts.startAt)).all()
    if (!source.length) throw invalidInput([{ field: 'weekStart', message: `no shifts at ${site.name} in the week from ${input.weekStart}` }])
    const people = new Map<number, number[]>()
    for (const r of tx.select().from(shiftAssignees).where(inArray(shiftAssignees.shiftId, source.map(s => s.id))).all()) {
      people.set(r.shiftId, [...(people.get(r.shiftId) ?? []), r.personId])
    }
    const copies = source.flatMap(row => Array.from({ length: input.weeks }, (_, k) => {
      const startWall = formatZonedIso(row.startAt.getTime(), site.timezone)
      const endWall = formatZonedIso(row.endAt.getTime(), site.timezone)
      const date = addDays(startWall.slice(0, 10), 7 * (k + 1))
      const start = resolveRotationTime(date, startWall.slice(11, 16), site.timezone)
      const end = resolveRotationTime(addDays(date, dayGap(startWall.slice(0, 10), endWall.slice(0, 10))), endWall.slice(11, 16), site.timezone)
      const endMs = end.ms > start.ms ? end.ms : start.ms + (row.endAt.getTime() - row.startAt.getTime())
      return { row, startMs: start.ms, endMs, personIds: people.get(row.id) ?? [] }
    }))
    const judged = judgeSiteShifts(tx, site, copies.map(c => ({ startMs: c.startMs, endMs: c.endMs, light: c.row.light, travelMinutes: c.row.travelMinutes, assigneeCount: c.personIds.length })))
    const rows = tx.insert(shifts).values(copies.map((c, i) => ({
      siteId: site.id, title: c.row.title, startAt: new Date(c.startMs), endAt: new Date(c.endMs), light: c.row.light,
      notes: c.row.notes, travelMinutes: c.row.travelMinutes, ...judged[i]!,
      reviewState: initialReviewState(judged[i]!.reviewReasons.length > 0), createdBy: actor.id
    }))).returning({ id: shifts.id, reviewState: shifts.reviewState }).all()
    const links = rows.flatMap((r, i) => copies[i]!.personIds.map(personId => ({ shiftId: r.id, personId })))
    if (links.length) tx.insert(shiftAssignees).values(links).run()
    recordAudit(tx, actor.id, 'shift.copy-week', 'site', site.id, { weekStart: input.weekStart, weeks: input.weeks, from: source.map(s => s.id), shiftIds: rows.map(r => r.id) })
    return { shiftIds: rows.map(r => r.id), firstWaiting: rows.find(r => r.reviewState === 'pending')?.id }
  })
  // as for a rotation, safety hear once of new work waiting for them
  if (result.firstWaiting !== undefined) {
    announceShiftChange({ kind: 'created', shiftId: result.firstWaiting, actorId: actor.id, previousAssigneeIds: [], material: true })
  }
  return { created: result.shiftIds.length, shiftIds: result.shiftIds }
}
