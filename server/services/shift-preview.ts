import { eq } from 'drizzle-orm'
import { shifts } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { fieldError } from '../utils/errors'
import { checkShiftLight } from '../core/light/check'
import { computeCandidateConflicts } from './conflict-context'
import { requireAssignees, requireSiteForShift, resolveShiftTimes, type ShiftInput } from './shifts'
import { formatZonedIso } from '../core/time/zoned'
import { assessShiftReview } from './reviews'

/**
 * What POST /api/shifts would store for this body (light check, the light bands over the shift, the
 * work-rule warnings), without writing. The same validation answers the same 400s as the write.
 */
export function previewShiftCheck(db: AppDatabase, body: ShiftInput & { shiftId?: number }) {
  const site = requireSiteForShift(db, body.siteId)
  const { startMs, endMs, notes } = resolveShiftTimes(body.start, body.end, site.timezone)
  const personIds = requireAssignees(db, body.assigneeIds)
  if (body.shiftId !== undefined && !db.select({ id: shifts.id }).from(shifts).where(eq(shifts.id, body.shiftId)).get()) {
    throw fieldError('shiftId', 'no such shift', { title: `Invalid shiftId: no shift with id ${body.shiftId}` })
  }
  const travelMinutes = body.travelMinutes ?? site.travelMinutes
  const check = checkShiftLight({ latitude: site.latitude, longitude: site.longitude, startMs, endMs, requirement: body.light, travelMinutes })
  // what would send it to safety review (light, cold, lone, long), as the write will store it
  const reviewReasonDetails = assessShiftReview(db, {
    site, window: { fromMs: check.checkedFromMs, toMs: check.checkedToMs }, startMs, endMs,
    lightCheck: { flagged: check.flagged, minutesBelow: check.minutesBelow, requirement: check.requirement }, assigneeCount: personIds.length
  })
  return {
    travelMinutes,
    reviewReasons: reviewReasonDetails.map(r => r.reason),
    reviewReasonDetails,
    lightCheck: {
      requirement: check.requirement, minutesBelow: check.minutesBelow, flagged: check.flagged,
      checkedFrom: formatZonedIso(check.checkedFromMs, site.timezone), checkedTo: formatZonedIso(check.checkedToMs, site.timezone)
    },
    bands: check.bands.map(b => ({ kind: b.kind, start: formatZonedIso(b.startMs, site.timezone), end: formatZonedIso(b.endMs, site.timezone) })),
    conflicts: computeCandidateConflicts(db, { shiftId: body.shiftId, startMs, endMs, personIds }),
    timeNotes: notes
  }
}
