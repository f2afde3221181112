// The review queue's view of rotations: a rotation with two or more shifts in the listed review state
// is one item, its shifts day by day with the worst day first; a lone shift of a rotation (one that
// changed after the rotation was decided, say) stays an ordinary item, so it comes back alone.
import { and, eq, gte, inArray, isNull, lte } from 'drizzle-orm'
import { z } from 'zod'
import { rotations, shifts, sites, type Rotation, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { formatZonedIso } from '../core/time/zoned'
import type { ReviewQueueItem } from '../core/review/queue'
import { SupportedYearSchema } from '../../shared/schemas/calendar'

/** The rotation as the API shows it. */
export function describeRotation(row: Rotation, site: Pick<Site, 'name' | 'timezone'>) {
  return {
    id: row.id, siteId: row.siteId, siteName: site.name, timezone: site.timezone, title: row.title, light: row.light,
    from: row.fromDate, to: row.toDate, startTime: row.startTime, endTime: row.endTime,
    onDays: row.onDays, offDays: row.offDays, assigneeIds: row.assigneeIds, travelMinutes: row.travelMinutes
  }
}

// Days shaped in full (light strip, cold figures, cautions); the rest are listed by their stored figures.
export const ROTATION_DETAIL_DAYS = 7

export interface RotationQueueDay {
  shiftId: number
  date: string
  start: string
  end: string
  minutesBelow: number
  reviewState: Shift['reviewState']
  reviewReasons: string[]
}

export interface RotationQueueGroup {
  rotation: ReturnType<typeof describeRotation>
  /** Ids of the rotation's shifts in this review state: one decision covers them all. */
  shiftIds: number[]
  /** The versions listed, sent back with the decision so that a shift changed since is left out. */
  seen: { id: number, version: number }[]
  firstStart: string
  summary: { shifts: number, minutesBelow: number, worstMinutesBelow: number, daysShort: number }
  /** The worst days in full, worst first. */
  days: ReviewQueueItem[]
  /** Every other day in this state, worst first, by its stored figures. */
  moreDays: RotationQueueDay[]
}

/** Splits queue rows: rotations with two or more rows become groups, everything else stays single. */
export function splitRotationRows<T extends Pick<Shift, 'rotationId'>>(rows: T[]): { groups: Map<number, T[]>, single: T[] } {
  const byRotation = new Map<number, T[]>()
  for (const row of rows) {
    if (row.rotationId === null) continue
    const list = byRotation.get(row.rotationId) ?? []
    list.push(row)
    byRotation.set(row.rotationId, list)
  }
  const groups = new Map([...byRotation].filter(([, list]) => list.length > 1))
  return { groups, single: rows.filter(r => r.rotationId === null || !groups.has(r.rotationId)) }
}

function worstFirst(a: Shift, b: Shift) {
  return b.minutesBelow - a.minutesBelow || a.startAt.getTime() - b.startAt.getTime()
}

/**
 * Shapes each rotation group for the queue. `shape` is the queue's own shaping of shift rows (light
 * strip, cold figures, crew, cautions), so a rotation's days read exactly like single items.
 */
export function buildRotationQueueGroups(db: Pick<AppDatabase, 'select'>, groups: Map<number, Shift[]>, shape: (rows: Shift[]) => ReviewQueueItem[]): RotationQueueGroup[] {
  if (!groups.size) return []
  const rotationRows = db.select().from(rotations).where(inArray(rotations.id, [...groups.keys()])).all()
  const siteRows = db.select().from(sites).where(inArray(sites.id, rotationRows.map(r => r.siteId))).all()
  const siteById = new Map(siteRows.map(s => [s.id, s]))
  const out: RotationQueueGroup[] = []
  const sorted = new Map(rotationRows.map(r => [r.id, [...groups.get(r.id)!].sort(worstFirst)]))
  // the worst days of every rotation shaped in one call (one read of people, reviews and weather)
  const byId = new Map(shape([...sorted.values()].flatMap(rows => rows.slice(0, ROTATION_DETAIL_DAYS))).map(item => [item.shift.id, item]))
  for (const rotation of rotationRows) {
    const site = siteById.get(rotation.siteId)!
    const rows = sorted.get(rotation.id)!
    const detailed = rows.slice(0, ROTATION_DETAIL_DAYS)
    const first = rows.reduce((min, r) => Math.min(min, r.startAt.getTime()), Infinity)
    out.push({
      rotation: describeRotation(rotation, site),
      shiftIds: rows.map(r => r.id),
      seen: rows.map(r => ({ id: r.id, version: r.version })),
      firstStart: formatZonedIso(first, site.timezone),
      summary: {
        shifts: rows.length,
        minutesBelow: rows.reduce((n, r) => n + r.minutesBelow, 0),
        worstMinutesBelow: rows[0]!.minutesBelow,
        daysShort: rows.filter(r => r.minutesBelow > 0).length
      },
      days: detailed.map(r => byId.get(r.id)!).filter(Boolean),
      moreDays: rows.slice(ROTATION_DETAIL_DAYS).map(r => ({
        shiftId: r.id,
        date: formatZonedIso(r.startAt.getTime(), site.timezone).slice(0, 10),
        start: formatZonedIso(r.startAt.getTime(), site.timezone),
        end: formatZonedIso(r.endAt.getTime(), site.timezone),
        minutesBelow: r.minutesBelow,
        reviewState: r.reviewState,
        reviewReasons: (r.reviewReasons ?? []).map(x => x.reason)
      }))
    })
  }
  return out.sort((a, b) => Date.parse(a.firstStart) - Date.parse(b.firstStart))
}

export const SiteRotationsQuerySchema = z.object({
  siteId: z.coerce.number({ error: 'siteId must be a site id' }).int().positive('siteId must be a site id'),
  year: SupportedYearSchema
})

/** The rotations planned at a site in a year, each with its live shifts (for the year chart). */
export function listSiteRotations(db: Pick<AppDatabase, 'select'>, siteId: number, year: number) {
  const site = db.select().from(sites).where(eq(sites.id, siteId)).get()
  if (!site) return { rotations: [] }
  const from = `${year}-01-01`
  const to = `${year}-12-31`
  const list = db.select().from(rotations).where(and(eq(rotations.siteId, siteId), lte(rotations.fromDate, to), gte(rotations.toDate, from))).all()
  if (!list.length) return { rotations: [] }
  const rows = db.select().from(shifts).where(and(inArray(shifts.rotationId, list.map(r => r.id)), isNull(shifts.cancelledAt))).orderBy(shifts.startAt).all()
  return {
    rotations: list.map(r => ({
      ...describeRotation(r, site),
      shifts: rows.filter(s => s.rotationId === r.id).map(s => ({
        id: s.id,
        start: formatZonedIso(s.startAt.getTime(), site.timezone),
        end: formatZonedIso(s.endAt.getTime(), site.timezone),
        minutesBelow: s.minutesBelow,
        reviewState: s.reviewState
      }))
    }))
  }
}
