// What the calendar feed reads, in one statement, and the light bands it needs, traced once per site.
// Explicit imports only, so unit tests can run it.
import { and, asc, eq, gt, gte, isNull, lt, sql } from 'drizzle-orm'
import { people, reviews, shiftAssignees, shifts, type Shift, type Site } from '../db/schema'
import type { LightPeriodMs } from '../../shared/light'
import { isReviewDecisionCurrent } from '../../shared/review'
import type { AppDatabase } from '../utils/db'
import { computeLightPeriodsInRange } from '../core/light/index'
import { MAX_SHIFT_MS, type ShiftReviewSummary } from './shifts'

const DAY_MS = 86_400_000

export interface FeedShiftRow {
  row: Shift
  assignees: { id: number, name: string }[]
  review: ShiftReviewSummary | null
}

/**
 * A person's shifts overlapping [fromMs, toMs) in one statement, each with its people and its latest
 * review decision (correlated subqueries), soonest first. No list of ids is bound, whatever their
 * number. Cancelled shifts come too when asked for (the feed keeps them as CANCELLED events).
 */
export function loadFeedShifts(db: AppDatabase, personId: number, fromMs: number, toMs: number, options: { includeCancelled?: boolean, startFrom?: number, startTo?: number } = {}): FeedShiftRow[] {
  const rows = db.select({
    shift: shifts,
    crew: sql<string>`(select json_group_array(json_array(c.id, c.name)) from (select p2.id, p2.name from ${shiftAssignees} a2 join ${people} p2 on p2.id = a2.person_id where a2.shift_id = ${shifts.id} order by p2.id) c)`,
    review: sql<string | null>`(select json_array(r.decision, r.mitigations, r.note, r.created_at, rp.name) from ${reviews} r join ${people} rp on rp.id = r.reviewer_id where r.shift_id = ${shifts.id} order by r.id desc limit 1)`
  }).from(shiftAssignees)
    .innerJoin(shifts, eq(shifts.id, shiftAssignees.shiftId))
    .where(and(
      eq(shiftAssignees.personId, personId),
      options.includeCancelled ? undefined : isNull(shifts.cancelledAt),
      lt(shifts.startAt, new Date(toMs)),
      // no shift lasts longer than MAX_SHIFT_MS: the start index then reads the window alone
      gt(shifts.startAt, new Date(fromMs - MAX_SHIFT_MS)),
      gt(shifts.endAt, new Date(fromMs)),
      // one page of starts, [startFrom, startTo), when the caller reads in pages
      options.startFrom !== undefined ? gte(shifts.startAt, new Date(options.startFrom)) : undefined,
      options.startTo !== undefined ? lt(shifts.startAt, new Date(options.startTo)) : undefined
    ))
    .orderBy(asc(shifts.startAt)).all()
  return rows.map(({ shift, crew, review }) => {
    const decided = review ? JSON.parse(review) as [ShiftReviewSummary['decision'], string, string, number, string] : null
    return {
      row: shift,
      assignees: (JSON.parse(crew) as [number, string][]).map(([id, name]) => ({ id, name })),
      review: decided && {
        decision: decided[0],
        mitigations: JSON.parse(decided[1]) as string[],
        note: decided[2],
        reviewerName: decided[4],
        at: new Date(decided[3]).toISOString(),
        current: isReviewDecisionCurrent(shift.reviewState, decided[0], true)
      }
    }
  })
}

/**
 * The light bands of each site over the span of its shifts, traced once per site (in slices the
 * engine accepts) and cut per shift with `cut`: one trace per site rather than one per shift.
 */
export function createSiteBandCutter(siteById: Map<number, Pick<Site, 'id' | 'latitude' | 'longitude'>>, feedRows: FeedShiftRow[]) {
  const spans = new Map<number, { fromMs: number, toMs: number }>()
  for (const { row } of feedRows) {
    const span = spans.get(row.siteId)
    const startMs = row.startAt.getTime()
    const endMs = row.endAt.getTime()
    if (!span) spans.set(row.siteId, { fromMs: startMs, toMs: endMs })
    else {
      span.fromMs = Math.min(span.fromMs, startMs)
      span.toMs = Math.max(span.toMs, endMs)
    }
  }
  const traced = new Map<number, LightPeriodMs[]>()
  const bandsOf = (siteId: number) => {
    let bands = traced.get(siteId)
    if (!bands) {
      const site = siteById.get(siteId)!
      const span = spans.get(siteId)!
      bands = []
      for (let start = span.fromMs; start < span.toMs; start += 300 * DAY_MS) {
        bands.push(...computeLightPeriodsInRange(site.latitude, site.longitude, start, Math.min(span.toMs, start + 300 * DAY_MS)))
      }
      traced.set(siteId, bands)
    }
    return bands
  }
  return {
    /** The bands of [startMs, endMs) at a site that has shifts in the rows, clipped to that span. */
    cut(siteId: number, startMs: number, endMs: number): LightPeriodMs[] {
      const bands = bandsOf(siteId)
      let lo = 0
      let hi = bands.length
      while (lo < hi) {
        const mid = (lo + hi) >> 1
        if (bands[mid]!.endMs <= startMs) lo = mid + 1
        else hi = mid
      }
      const out: LightPeriodMs[] = []
      for (let i = lo; i < bands.length && bands[i]!.startMs < endMs; i++) {
        const b = bands[i]!
        const kind = b.kind
        const from = Math.max(b.startMs, startMs)
        const to = Math.min(b.endMs, endMs)
        const last = out[out.length - 1]
        // slices meet at a cut of the trace: same-kind neighbours are one band
        if (last && last.kind === kind && last.endMs === from) last.endMs = to
        else if (to > from) out.push({ kind, startMs: from, endMs: to })
      }
      return out
    }
  }
}
