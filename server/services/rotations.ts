// Rotations on the database: a cycle expanded into ordinary shifts (each light-checked, in review
// when flagged, conflict-checked, marked with its rotation), written in one transaction with one
// audit entry; changed or cancelled from a date; decided by safety as one piece of work.
import { and, asc, eq, gte, inArray, isNull } from 'drizzle-orm'
import { z } from 'zod'
import type { User } from '#auth-utils'
import { rotations, shiftAssignees, shifts, sites, type Rotation, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { LightRequirementSchema, LocalDateSchema, TravelMinutesSchema, singleLineText } from '../utils/validation'
import { notFound } from '../utils/errors'
import { computeOutingWindow } from '../core/light/check'
import { formatZonedIso, localMidnightMs } from '../core/time/zoned'
import {
  expandRotation, findRotationIssues, planRotationShift, rankRotationDays, summariseRotation,
  MAX_CYCLE_DAYS, type PlannedShift, type RotationCycle
} from '../core/planning/rotation'
import { addConflictNeighbours, checkConflictsWith, loadConflictContext } from './conflict-context'
import { computeStoredCheck, loadAssignees, loadLatestReviews, loadShiftRowConflicts, requireAssignees, requireSiteForShift, toShiftView } from './shifts'
import { cancelShift, initialReviewState, updateShift } from './shift-writes'
import { recordAudit } from './audit'
import { loadWorkRules } from './work-rules'
import { loadSiteForecast, loadSiteObservations } from './site-weather'
import { nowMs as clockNowMs } from '../core/time/clock'
import { announceShiftChange } from './shift-notices'
import { assessShiftReview, recordReviewDecision, type ReviewInput } from './reviews'
import { describeRotation } from './rotation-queue'
import type { ShiftConflict } from '../../shared/types/shift'
import { describeReviewReason, type ReviewReasonDetail } from '../../shared/review'

const HOUR_MS = 3_600_000
const TimeOfDaySchema = z.string({ error: 'expected a time of day as HH:mm' })
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'expected a time of day as HH:mm, 00:00 to 23:59')
const AssigneeIdsSchema = z.array(z.number({ error: 'expected a person id' }).int().positive(), { error: 'expected a list of person ids' }).max(200)

/** POST /api/rotations (and its preview): the cycle, the task and the people. */
export const RotationBodySchema = z.object({
  siteId: z.number({ error: 'expected a site id' }).int().positive(),
  title: singleLineText(200),
  light: LightRequirementSchema,
  from: LocalDateSchema,
  to: LocalDateSchema,
  startTime: TimeOfDaySchema,
  endTime: TimeOfDaySchema,
  onDays: z.number({ error: 'expected a number of working days' }).int('must be whole days').min(1, 'a cycle needs at least 1 working day').max(MAX_CYCLE_DAYS, `at most ${MAX_CYCLE_DAYS}`),
  offDays: z.number({ error: 'expected a number of days off' }).int('must be whole days').min(0, 'must be 0 or more').max(MAX_CYCLE_DAYS, `at most ${MAX_CYCLE_DAYS}`),
  assigneeIds: AssigneeIdsSchema.default([]),
  travelMinutes: TravelMinutesSchema.optional()
}).superRefine((body, ctx) => {
  for (const issue of findRotationIssues(body)) {
    if (issue.field === 'to') ctx.addIssue({ code: 'custom', path: ['to'], message: issue.message })
  }
})
export type RotationInput = z.output<typeof RotationBodySchema>

/** PATCH /api/rotations/:id: what changes, for its shifts on and after fromDate. */
export const RotationPatchSchema = z.object({
  fromDate: LocalDateSchema,
  title: singleLineText(200).optional(),
  light: LightRequirementSchema.optional(),
  startTime: TimeOfDaySchema.optional(),
  endTime: TimeOfDaySchema.optional(),
  assigneeIds: AssigneeIdsSchema.optional(),
  travelMinutes: TravelMinutesSchema.optional()
})
export type RotationPatch = z.output<typeof RotationPatchSchema>

export const RotationCancelQuerySchema = z.object({ from: LocalDateSchema })

function cycleOf(input: RotationInput): RotationCycle {
  return { from: input.from, to: input.to, startTime: input.startTime, endTime: input.endTime, onDays: input.onDays, offDays: input.offDays }
}

// The other shifts of the same rotation, as neighbours of each other: its people work them all, so
// overlaps and short rest between its own days are warnings too. Ids are negative: nothing is stored.
function plannedNeighbours(planned: PlannedShift[], personIds: number[], title: string, siteName: string) {
  return planned.flatMap(p => personIds.map(personId => ({ shiftId: -1 - p.index, personId, startMs: p.startMs, endMs: p.endMs, title, siteName })))
}

interface CheckedPlan extends PlannedShift {
  minutesBelow: number
  flagged: boolean
  conflicts: ShiftConflict[]
  reviewReasons: ReviewReasonDetail[]
}

/** One shift to judge: its times, the light it needs, its travel each way and how many people. */
export interface ShiftToJudge {
  startMs: number
  endMs: number
  light: Shift['light']
  travelMinutes: number
  assigneeCount: number
}

/**
 * Judges many shifts of one site as the shift service judges a single one (light check over the
 * outing, review reasons), reading the work rules, forecast and site readings once for all of them.
 */
export function judgeSiteShifts(db: Pick<AppDatabase, 'select'>, site: Site, items: ShiftToJudge[]) {
  if (!items.length) return []
  let fromMs = Infinity
  let toMs = -Infinity
  for (const i of items) {
    fromMs = Math.min(fromMs, i.startMs - i.travelMinutes * 60_000)
    toMs = Math.max(toMs, i.endMs + i.travelMinutes * 60_000)
  }
  const preloaded = {
    rules: loadWorkRules(db),
    forecast: loadSiteForecast(db, site.id, clockNowMs()),
    readings: loadSiteObservations(db, site.id, fromMs - 3 * HOUR_MS, toMs)
  }
  return items.map((i) => {
    const check = computeStoredCheck(site, i.startMs, i.endMs, i.light, i.travelMinutes)
    const reviewReasons = assessShiftReview(db, {
      site, window: computeOutingWindow(i.startMs, i.endMs, i.travelMinutes), startMs: i.startMs, endMs: i.endMs,
      lightCheck: { ...check, requirement: i.light }, assigneeCount: i.assigneeCount, preloaded
    })
    return { ...check, reviewReasons }
  })
}

function checkPlan(db: Pick<AppDatabase, 'select'>, site: Site, input: RotationInput, personIds: number[]): CheckedPlan[] {
  const planned = expandRotation(cycleOf(input), site.timezone)
  const travel = input.travelMinutes ?? site.travelMinutes
  const loaded = addConflictNeighbours(
    loadConflictContext(db, planned.map(p => ({ startMs: p.startMs, endMs: p.endMs, personIds }))),
    plannedNeighbours(planned, personIds, input.title, site.name)
  )
  const judged = judgeSiteShifts(db, site, planned.map(p => ({ startMs: p.startMs, endMs: p.endMs, light: input.light, travelMinutes: travel, assigneeCount: personIds.length })))
  return planned.map((p, i) => ({
    ...p,
    ...judged[i]!,
    conflicts: checkConflictsWith(loaded, { shiftId: -1 - p.index, startMs: p.startMs, endMs: p.endMs, personIds })
  }))
}

/** What POST /api/rotations would make, without writing: every shift over the light, worst days first. */
export function previewRotation(db: AppDatabase, input: RotationInput) {
  const site = requireSiteForShift(db, input.siteId)
  const personIds = requireAssignees(db, input.assigneeIds)
  const checked = checkPlan(db, site, input, personIds)
  const shiftsOut = checked.map(c => ({
    date: c.date,
    start: formatZonedIso(c.startMs, site.timezone),
    end: formatZonedIso(c.endMs, site.timezone),
    minutesBelow: c.minutesBelow,
    flagged: c.flagged,
    reviewReasons: c.reviewReasons.map(r => r.reason),
    reviewReasonWords: c.reviewReasons.map(r => describeReviewReason(r, site.timezone)),
    conflicts: c.conflicts,
    timeNotes: c.timeNotes
  }))
  return {
    timezone: site.timezone,
    siteName: site.name,
    shifts: shiftsOut,
    summary: { ...summariseRotation(checked), conflicts: checked.filter(c => c.conflicts.length).length, toReview: checked.filter(c => c.reviewReasons.length).length },
    worstDays: rankRotationDays(shiftsOut.map(s => ({ ...s, conflicts: s.conflicts.length }))).filter(d => d.minutesBelow > 0 || d.conflicts > 0).slice(0, 10)
  }
}

/** Makes a rotation and all its shifts in one transaction; returns the rotation id. */
export function createRotation(db: AppDatabase, actor: Pick<User, 'id'>, input: RotationInput): number {
  const result = db.transaction((tx) => {
    const site = requireSiteForShift(tx, input.siteId)
    const personIds = requireAssignees(tx, input.assigneeIds)
    const checked = checkPlan(tx, site, input, personIds)
    const rotation = tx.insert(rotations).values({
      siteId: site.id, title: input.title, light: input.light, fromDate: input.from, toDate: input.to,
      startTime: input.startTime, endTime: input.endTime, onDays: input.onDays, offDays: input.offDays,
      travelMinutes: input.travelMinutes ?? null, assigneeIds: personIds, createdBy: actor.id
    }).returning().get()
    const travel = input.travelMinutes ?? site.travelMinutes
    const rows = tx.insert(shifts).values(checked.map(c => ({
      siteId: site.id, title: input.title, startAt: new Date(c.startMs), endAt: new Date(c.endMs), light: input.light,
      travelMinutes: travel, minutesBelow: c.minutesBelow, flagged: c.flagged, reviewReasons: c.reviewReasons,
      reviewState: initialReviewState(c.reviewReasons.length > 0),
      createdBy: actor.id, rotationId: rotation.id
    }))).returning({ id: shifts.id, reviewState: shifts.reviewState }).all()
    if (personIds.length) {
      tx.insert(shiftAssignees).values(rows.flatMap(r => personIds.map(personId => ({ shiftId: r.id, personId })))).run()
    }
    recordAudit(tx, actor.id, 'rotation.create', 'rotation', rotation.id, {
      title: input.title, from: input.from, to: input.to, onDays: input.onDays, offDays: input.offDays,
      shiftIds: rows.map(r => r.id), flagged: checked.filter(c => c.flagged).length,
      timeNotes: checked.flatMap(c => c.timeNotes)
    })
    return { id: rotation.id, firstWaiting: rows.find(r => r.reviewState === 'pending')?.id }
  })
  // Safety hear of a new rotation once, through its first waiting shift, not once per shift: the
  // queue shows the rotation as one item.
  if (result.firstWaiting !== undefined) {
    announceShiftChange({ kind: 'created', shiftId: result.firstWaiting, actorId: actor.id, previousAssigneeIds: [], material: true })
  }
  return result.id
}

function requireRotation(db: Pick<AppDatabase, 'select'>, id: number): Rotation {
  const row = db.select().from(rotations).where(eq(rotations.id, id)).get()
  if (!row) throw notFound('Rotation')
  return row
}

function loadRotationShiftRows(db: Pick<AppDatabase, 'select'>, rotationId: number): Shift[] {
  return db.select().from(shifts).where(eq(shifts.rotationId, rotationId)).orderBy(asc(shifts.startAt)).all()
}

/** GET /api/rotations/:id: the rotation, every shift of it (cancelled ones marked), totals over the live ones. */
export function loadRotationReply(db: AppDatabase, id: number) {
  const row = requireRotation(db, id)
  const site = db.select().from(sites).where(eq(sites.id, row.siteId)).get()!
  const rows = loadRotationShiftRows(db, id)
  const assignees = loadAssignees(db, rows.map(r => r.id))
  const latest = loadLatestReviews(db, rows)
  const conflicts = loadShiftRowConflicts(db, rows, assignees)
  const views = rows.map(r => toShiftView(r, site, assignees.get(r.id) ?? [], latest.get(r.id) ?? null, conflicts.get(r.id) ?? []))
  const live = rows.filter(r => r.cancelledAt === null)
  return { rotation: describeRotation(row, site), shifts: views, summary: summariseRotation(live) }
}

// The live shifts of a rotation that start on or after a local date in the site's zone.
function shiftsFromDate(db: Pick<AppDatabase, 'select'>, rotationId: number, date: string, timezone: string): Shift[] {
  return db.select().from(shifts)
    .where(and(eq(shifts.rotationId, rotationId), isNull(shifts.cancelledAt), gte(shifts.startAt, new Date(localMidnightMs(date, timezone)))))
    .orderBy(asc(shifts.startAt)).all()
}

/**
 * Changes the rotation's shifts on and after fromDate through the shift service's own update (so each
 * is re-checked, and re-opened for review when the change is material), all in one transaction.
 */
export function updateRotationFrom(db: AppDatabase, actor: Pick<User, 'id'>, id: number, patch: RotationPatch) {
  const changed = db.transaction((tx) => {
    const row = requireRotation(tx, id)
    const site = requireSiteForShift(tx, row.siteId)
    if (patch.assigneeIds) requireAssignees(tx, patch.assigneeIds)
    const times = { startTime: patch.startTime ?? row.startTime, endTime: patch.endTime ?? row.endTime }
    const rows = shiftsFromDate(tx, id, patch.fromDate, site.timezone)
    for (const shift of rows) {
      const date = formatZonedIso(shift.startAt.getTime(), site.timezone).slice(0, 10)
      const timed = patch.startTime || patch.endTime ? planRotationShift(date, 0, times, site.timezone) : null
      updateShift(tx as unknown as AppDatabase, actor, shift.id, {
        title: patch.title, light: patch.light, assigneeIds: patch.assigneeIds, travelMinutes: patch.travelMinutes,
        start: timed ? new Date(timed.startMs).toISOString() : undefined,
        end: timed ? new Date(timed.endMs).toISOString() : undefined
      })
    }
    tx.update(rotations).set({
      title: patch.title ?? row.title, light: patch.light ?? row.light, ...times,
      assigneeIds: patch.assigneeIds ?? row.assigneeIds, travelMinutes: patch.travelMinutes ?? row.travelMinutes, updatedAt: new Date()
    }).where(eq(rotations.id, id)).run()
    recordAudit(tx, actor.id, 'rotation.update', 'rotation', id, { patch, shiftIds: rows.map(r => r.id) })
    return rows.length
  })
  return { changed }
}

/** Cancels the rotation's live shifts from a local date on, one transaction. */
export function cancelRotationFrom(db: AppDatabase, actor: Pick<User, 'id'>, id: number, from: string) {
  const cancelled = db.transaction((tx) => {
    const row = requireRotation(tx, id)
    const site = requireSiteForShift(tx, row.siteId)
    const rows = shiftsFromDate(tx, id, from, site.timezone)
    for (const shift of rows) cancelShift(tx as unknown as AppDatabase, actor, shift.id)
    recordAudit(tx, actor.id, 'rotation.cancel', 'rotation', id, { from, shiftIds: rows.map(r => r.id) })
    return rows.length
  })
  return { cancelled }
}

/** The shift versions the reviewer saw (optional): a shift changed since is left waiting, on its own. */
export const RotationReviewSeenSchema = z.object({
  seen: z.array(z.object({ id: z.number().int().positive(), version: z.number().int().positive() }), { error: 'expected the shifts you saw, as { id, version }' }).max(1000).optional()
})

/**
 * One safety decision for every shift of the rotation still waiting (pending or sent back for
 * changes), each recorded as the shift service records a single decision, in one transaction. With
 * `seen`, only the shifts the reviewer saw, at the version seen, are decided; others keep waiting.
 */
export function reviewRotation(db: AppDatabase, actor: Pick<User, 'id'>, id: number, input: ReviewInput, seen?: { id: number, version: number }[]) {
  return db.transaction((tx) => {
    requireRotation(tx, id)
    const waiting = tx.select({ id: shifts.id, version: shifts.version }).from(shifts)
      .where(and(eq(shifts.rotationId, id), isNull(shifts.cancelledAt), inArray(shifts.reviewState, ['pending', 'changes-requested'])))
      .orderBy(asc(shifts.startAt)).all()
    const seenVersion = seen ? new Map(seen.map(s => [s.id, s.version])) : null
    const chosen = seenVersion ? waiting.filter(s => seenVersion.get(s.id) === s.version) : waiting
    for (const shift of chosen) recordReviewDecision(tx as unknown as AppDatabase, actor, shift.id, { ...input, version: shift.version })
    recordAudit(tx, actor.id, 'rotation.review', 'rotation', id, { decision: input.decision, shiftIds: chosen.map(s => s.id) })
    return { decided: chosen.length, shiftIds: chosen.map(s => s.id), stillWaiting: waiting.length - chosen.length }
  })
}
