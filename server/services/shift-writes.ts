import { eq } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { shiftAssignees, shifts, type Shift } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { computeStoredCheck, requireAssignees, requireSiteForShift, resolveShiftTimes, type ShiftInput, type ShiftPatch } from './shifts'
import { conflict, notFound } from '../utils/errors'
import { announceShiftChange } from './shift-notices'
import { assessShiftReview } from './reviews'
import { computeCandidateConflicts } from './conflict-context'
import type { ShiftConflict } from '../core/planning/conflicts'
import { computeOutingWindow } from '../core/light/check'
import { nowDate } from '../core/time/clock'

/** A shift with any review reason (light, cold, lone, long) waits for review; one with none needs none. */
export function initialReviewState(needsReview: boolean): Shift['reviewState'] {
  return needsReview ? 'pending' : 'not-needed'
}

/** Creates a shift with its assignees, light check and audit entry in one transaction. */
export function createShift(db: AppDatabase, actor: Pick<User, 'id'>, input: ShiftInput) {
  const result = db.transaction((tx) => {
    const site = requireSiteForShift(tx, input.siteId)
    const { startMs, endMs, notes } = resolveShiftTimes(input.start, input.end, site.timezone)
    const assigneeIds = requireAssignees(tx, input.assigneeIds)
    const travelMinutes = input.travelMinutes ?? site.travelMinutes
    const check = computeStoredCheck(site, startMs, endMs, input.light, travelMinutes)
    const reviewReasons = assessShiftReview(tx, { site, window: computeOutingWindow(startMs, endMs, travelMinutes), startMs, endMs, lightCheck: { ...check, requirement: input.light }, assigneeCount: assigneeIds.length })
    const row = tx.insert(shifts).values({
      siteId: site.id,
      title: input.title,
      startAt: new Date(startMs),
      endAt: new Date(endMs),
      light: input.light,
      notes: input.notes ?? '',
      travelMinutes,
      conflictOverride: input.overrideReason || null,
      ...check,
      reviewReasons,
      reviewState: initialReviewState(reviewReasons.length > 0),
      createdBy: actor.id
    }).returning().get()
    if (assigneeIds.length) tx.insert(shiftAssignees).values(assigneeIds.map(personId => ({ shiftId: row.id, personId }))).run()
    recordAudit(tx, actor.id, 'shift.create', 'shift', row.id, { title: row.title, flagged: row.flagged, timeNotes: notes })
    const conflicts = computeCandidateConflicts(tx, { shiftId: row.id, startMs, endMs, personIds: assigneeIds })
    recordConflictOverride(tx, actor.id, row.id, input.overrideReason, conflicts)
    return { id: row.id, timeNotes: notes, conflicts }
  })
  announceShiftChange({ kind: 'created', shiftId: result.id, actorId: actor.id, previousAssigneeIds: [], material: true })
  return result
}

/**
 * Conflicts never stop a shift; a coordinator who keeps one despite its warnings states why, and the
 * audit log keeps the reason with the warnings it overrode.
 */
export function recordConflictOverride(tx: Pick<AppDatabase, 'insert'>, actorId: number, shiftId: number, reason: string | undefined, conflicts: ShiftConflict[]) {
  if (!reason || !conflicts.length) return
  recordAudit(tx, actorId, 'shift.conflict-override', 'shift', shiftId, { reason, conflicts })
}

function sameIds(a: number[], b: number[]) {
  if (a.length !== b.length) return false
  const sortedB = [...b].sort((x, y) => x - y)
  return [...a].sort((x, y) => x - y).every((v, i) => v === sortedB[i])
}

/**
 * Applies a change. A stale version is refused with 409. Changing the time, site, requirement
 * or people re-checks the light and puts any earlier review decision back in the queue.
 */
export function updateShift(db: AppDatabase, actor: Pick<User, 'id'>, id: number, patch: ShiftPatch) {
  const result = db.transaction((tx) => {
    const current = tx.select().from(shifts).where(eq(shifts.id, id)).get()
    if (!current) throw notFound('Shift')
    if (current.cancelledAt) throw conflict('This shift was cancelled; it can no longer be changed.', { currentVersion: current.version })
    if (patch.version !== undefined && patch.version !== current.version) {
      throw conflict('This shift was changed by someone else since you opened it. Reload it and apply your change again.', { currentVersion: current.version })
    }
    const site = requireSiteForShift(tx, patch.siteId ?? current.siteId)
    const currentIds = tx.select({ id: shiftAssignees.personId }).from(shiftAssignees).where(eq(shiftAssignees.shiftId, id)).all().map(r => r.id)
    const times = resolveShiftTimes(patch.start ?? current.startAt.toISOString(), patch.end ?? current.endAt.toISOString(), site.timezone)
    const assigneeIds = patch.assigneeIds ? requireAssignees(tx, patch.assigneeIds) : currentIds
    const light = patch.light ?? current.light
    const travelMinutes = patch.travelMinutes ?? current.travelMinutes
    const material = travelMinutes !== current.travelMinutes || site.id !== current.siteId || times.startMs !== current.startAt.getTime()
      || times.endMs !== current.endAt.getTime() || light !== current.light || !sameIds(assigneeIds, currentIds)
    const check = computeStoredCheck(site, times.startMs, times.endMs, light, travelMinutes)
    const reviewReasons = assessShiftReview(tx, { site, window: computeOutingWindow(times.startMs, times.endMs, travelMinutes), startMs: times.startMs, endMs: times.endMs, lightCheck: { ...check, requirement: light }, assigneeCount: assigneeIds.length })
    // a material change re-opens any decision; a new reason on an unchanged shift (new forecast) needs one too
    const reviewState = material || (current.reviewState === 'not-needed' && reviewReasons.length)
      ? initialReviewState(reviewReasons.length > 0)
      : current.reviewState
    tx.update(shifts).set({
      siteId: site.id,
      title: patch.title ?? current.title,
      startAt: new Date(times.startMs),
      endAt: new Date(times.endMs),
      light,
      notes: patch.notes ?? current.notes,
      travelMinutes,
      conflictOverride: patch.overrideReason !== undefined ? (patch.overrideReason || null) : current.conflictOverride,
      ...check,
      reviewReasons,
      reviewState,
      version: current.version + 1,
      updatedAt: nowDate()
    }).where(eq(shifts.id, id)).run()
    if (patch.assigneeIds) {
      tx.delete(shiftAssignees).where(eq(shiftAssignees.shiftId, id)).run()
      if (assigneeIds.length) tx.insert(shiftAssignees).values(assigneeIds.map(personId => ({ shiftId: id, personId }))).run()
    }
    recordAudit(tx, actor.id, 'shift.update', 'shift', id, { patch, reopened: material && current.reviewState !== reviewState })
    const conflicts = computeCandidateConflicts(tx, { shiftId: id, startMs: times.startMs, endMs: times.endMs, personIds: assigneeIds })
    recordConflictOverride(tx, actor.id, id, patch.overrideReason, conflicts)
    return { id, timeNotes: times.notes, material, conflicts, previous: { reviewState: current.reviewState, assigneeIds: currentIds } }
  })
  announceShiftChange({ kind: 'updated', shiftId: id, actorId: actor.id, previousAssigneeIds: result.previous.assigneeIds, material: result.material })
  return result
}

/**
 * Cancels a shift: it keeps its record (and review history) but drops out of lists and conflict
 * checks. A stale version is refused with 409 like an edit; cancelling twice is refused too, so the
 * crew are told once.
 */
export function cancelShift(db: AppDatabase, actor: Pick<User, 'id'>, id: number, version?: number) {
  const result = db.transaction((tx) => {
    const current = tx.select().from(shifts).where(eq(shifts.id, id)).get()
    if (!current) throw notFound('Shift')
    if (current.cancelledAt) throw conflict('This shift is already cancelled.', { currentVersion: current.version })
    if (version !== undefined && version !== current.version) {
      throw conflict('This shift was changed by someone else since you opened it. Reload it before cancelling.', { currentVersion: current.version })
    }
    tx.update(shifts).set({ cancelledAt: nowDate(), version: current.version + 1, updatedAt: nowDate() }).where(eq(shifts.id, id)).run()
    const assigneeIds = tx.select({ id: shiftAssignees.personId }).from(shiftAssignees).where(eq(shiftAssignees.shiftId, id)).all().map(r => r.id)
    recordAudit(tx, actor.id, 'shift.cancel', 'shift', id, { title: current.title, version: current.version + 1 })
    return { id, assigneeIds }
  })
  announceShiftChange({ kind: 'cancelled', shiftId: id, actorId: actor.id, previousAssigneeIds: result.assigneeIds, material: true })
  return result
}
