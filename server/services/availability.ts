import { and, asc, eq, gt, lt, type SQL } from 'drizzle-orm'
import { z } from 'zod'
import { people, sites, unavailability, type Person } from '../db/schema'
import { addDays } from '../../shared/format'
import { localMidnightMs } from '../core/time/zoned'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { fieldError, notFound } from '../utils/errors'
import { InstantSchema, LocalDateSchema } from '../utils/validation'

const DAY_MS = 86_400_000
// a blocked span longer than this is almost certainly a typo in the year
export const MAX_BLOCKED_SPAN_DAYS = 366

// A blocked span's bounds: an ISO instant with offset, or a whole day YYYY-MM-DD read in the person's
// own zone (a start date is that day's local midnight; an end date is inclusive, so it runs to the
// next local midnight). The person's zone: their own, else their home site's, else UTC.
const SpanBoundSchema = z.union([LocalDateSchema, InstantSchema], { error: 'expected YYYY-MM-DD (a whole day in the person\'s zone) or an ISO 8601 instant with an offset' })

export const UnavailabilityBodySchema = z.object({
  personId: z.number({ error: 'expected a person id' }).int().positive(),
  start: SpanBoundSchema,
  end: SpanBoundSchema,
  reason: z.string().trim().max(200, 'at most 200 characters').default('')
})

export const UnavailabilityQuerySchema = z.object({
  personId: z.coerce.number().int().positive().optional(),
  from: SpanBoundSchema.optional(),
  to: SpanBoundSchema.optional()
})

export interface BlockedSpanView {
  id: number
  personId: number
  personName: string
  start: string
  end: string
  reason: string
  /** The zone the person's whole days are read in. */
  timezone: string
}

function isWholeDay(value: string) {
  return value.length === 10
}

/** The instant a span bound names, whole days read in `zone`; a whole-day end covers that day. */
export function readSpanBound(value: string, edge: 'start' | 'end', zone = 'UTC'): number {
  if (!isWholeDay(value)) return Date.parse(value)
  return localMidnightMs(edge === 'end' ? addDays(value, 1) : value, zone)
}

/** The zone a person's whole days away are read in: their own, else their home site's, else UTC. */
export function resolvePersonZone(db: Pick<AppDatabase, 'select'>, person: Pick<Person, 'timezone' | 'homeSiteId'>): string {
  if (person.timezone) return person.timezone
  if (person.homeSiteId) {
    const site = db.select({ timezone: sites.timezone }).from(sites).where(eq(sites.id, person.homeSiteId)).get()
    if (site) return site.timezone
  }
  return 'UTC'
}

function zoneOfPersonId(db: Pick<AppDatabase, 'select'>, personId: number | undefined): string {
  if (!personId) return 'UTC'
  const person = db.select({ timezone: people.timezone, homeSiteId: people.homeSiteId }).from(people).where(eq(people.id, personId)).get()
  return person ? resolvePersonZone(db, person) : 'UTC'
}

/** Blocked spans overlapping [from, to) (both optional), for one person or everyone, by start. */
export function listBlockedSpans(db: Pick<AppDatabase, 'select'>, query: z.infer<typeof UnavailabilityQuerySchema>): BlockedSpanView[] {
  const conditions: SQL[] = []
  // one person's list reads its dates in their zone; everyone's in UTC
  const zone = zoneOfPersonId(db, query.personId)
  if (query.personId) conditions.push(eq(unavailability.personId, query.personId))
  if (query.from) conditions.push(gt(unavailability.endAt, new Date(readSpanBound(query.from, 'start', zone))))
  if (query.to) conditions.push(lt(unavailability.startAt, new Date(readSpanBound(query.to, 'end', zone))))
  return db.select({ id: unavailability.id, personId: unavailability.personId, personName: people.name, startAt: unavailability.startAt, endAt: unavailability.endAt, reason: unavailability.reason })
    .from(unavailability).innerJoin(people, eq(people.id, unavailability.personId))
    .where(conditions.length ? and(...conditions) : undefined)
    .orderBy(asc(unavailability.startAt)).all()
    .map(r => ({ id: r.id, personId: r.personId, personName: r.personName, start: r.startAt.toISOString(), end: r.endAt.toISOString(), reason: r.reason, timezone: zoneOfPersonId(db, r.personId) }))
}

/** Records a blocked span (leave, travel day) for a person, with an audit entry. */
export function createBlockedSpan(db: AppDatabase, actorId: number, input: z.infer<typeof UnavailabilityBodySchema>): BlockedSpanView {
  const person = db.select({ id: people.id, timezone: people.timezone, homeSiteId: people.homeSiteId }).from(people).where(eq(people.id, input.personId)).get()
  if (!person) throw fieldError('personId', `no person with id ${input.personId}`)
  const zone = resolvePersonZone(db, person)
  const startMs = readSpanBound(input.start, 'start', zone)
  const endMs = readSpanBound(input.end, 'end', zone)
  if (!(endMs > startMs)) throw fieldError('end', 'must be after start')
  if (endMs - startMs > MAX_BLOCKED_SPAN_DAYS * DAY_MS) throw fieldError('end', `a blocked span may last at most ${MAX_BLOCKED_SPAN_DAYS} days`)
  const id = db.transaction((tx) => {
    const person = tx.select({ id: people.id }).from(people).where(eq(people.id, input.personId)).get()
    if (!person) throw fieldError('personId', `no person with id ${input.personId}`)
    const row = tx.insert(unavailability).values({ personId: input.personId, startAt: new Date(startMs), endAt: new Date(endMs), reason: input.reason }).returning().get()
    recordAudit(tx, actorId, 'unavailability.create', 'unavailability', row.id, { personId: row.personId, start: new Date(startMs).toISOString(), end: new Date(endMs).toISOString(), zone })
    return row.id
  })
  return findBlockedSpan(db, id)!
}

/** One blocked span as the API shows it. */
export function findBlockedSpan(db: Pick<AppDatabase, 'select'>, id: number): BlockedSpanView | undefined {
  const row = db.select({ id: unavailability.id, personId: unavailability.personId, personName: people.name, startAt: unavailability.startAt, endAt: unavailability.endAt, reason: unavailability.reason })
    .from(unavailability).innerJoin(people, eq(people.id, unavailability.personId)).where(eq(unavailability.id, id)).get()
  return row && { id: row.id, personId: row.personId, personName: row.personName, start: row.startAt.toISOString(), end: row.endAt.toISOString(), reason: row.reason, timezone: zoneOfPersonId(db, row.personId) }
}

/** Deletes a blocked span, with an audit entry. */
export function deleteBlockedSpan(db: AppDatabase, actorId: number, id: number) {
  db.transaction((tx) => {
    const before = findBlockedSpan(tx, id)
    if (!before) throw notFound('Blocked span')
    tx.delete(unavailability).where(eq(unavailability.id, id)).run()
    recordAudit(tx, actorId, 'unavailability.delete', 'unavailability', id, { ...before })
  })
  return { id, deleted: true }
}
