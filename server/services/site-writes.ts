import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { shiftAssignees, shifts, sites, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { conflict, notFound } from '../utils/errors'
import { announceShiftChange } from './shift-notices'
import { computeStoredCheck } from './shifts'
import { initialReviewState } from './shift-writes'
import { assessShiftReview } from './reviews'
import { SiteBodySchema } from '../../shared/schemas/site'
import { computeOutingWindow } from '../core/light/check'
import { nowDate } from '../core/time/clock'

export const SitePatchSchema = SiteBodySchema.partial()
export type SitePatch = z.infer<typeof SitePatchSchema>

export const SiteArchiveSchema = z.object({ archived: z.boolean({ error: 'must be true or false' }) })

type Tx = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]

interface RecheckedShift {
  id: number
  assigneeIds: number[]
  flaggedNow: boolean
}

// Names are compared in JS: SQLite's lower() folds ASCII only, and site names may be Norwegian or Sámi.
function requireFreeSiteName(tx: Tx, name: string, exceptId: number) {
  const key = name.toLocaleLowerCase('en')
  const clash = tx.select({ id: sites.id, name: sites.name }).from(sites).all()
    .find(row => row.id !== exceptId && row.name.toLocaleLowerCase('en') === key)
  if (clash) throw conflict(`Another site is already named “${name}”`, { issues: [{ field: 'name', message: 'already in use' }] })
}

/**
 * Re-checks the light of every live shift at a site after its coordinates or zone changed. Moved
 * coordinates are a material change (as a new site would be in updateShift): earlier review decisions
 * go back to the queue. A zone change alone leaves the instants, and so the sun, as they were.
 */
function recheckSiteShifts(tx: Tx, site: Site, material: boolean): RecheckedShift[] {
  const rows = tx.select().from(shifts).where(and(eq(shifts.siteId, site.id), isNull(shifts.cancelledAt))).all()
  const changed: RecheckedShift[] = []
  for (const row of rows) {
    const check = computeStoredCheck(site, row.startAt.getTime(), row.endAt.getTime(), row.light, row.travelMinutes)
    const assigneeCount = tx.select({ id: shiftAssignees.personId }).from(shiftAssignees).where(eq(shiftAssignees.shiftId, row.id)).all().length
    const reviewReasons = assessShiftReview(tx, { site, window: computeOutingWindow(row.startAt.getTime(), row.endAt.getTime(), row.travelMinutes), startMs: row.startAt.getTime(), endMs: row.endAt.getTime(), lightCheck: { ...check, requirement: row.light }, assigneeCount })
    const reviewState = material ? initialReviewState(reviewReasons.length > 0) : row.reviewState
    const sameReasons = JSON.stringify(reviewReasons) === JSON.stringify(row.reviewReasons)
    if (check.minutesBelow === row.minutesBelow && check.flagged === row.flagged && reviewState === row.reviewState && sameReasons) continue
    tx.update(shifts).set({ ...check, reviewReasons, reviewState, version: row.version + 1, updatedAt: nowDate() }).where(eq(shifts.id, row.id)).run()
    const assigneeIds = tx.select({ id: shiftAssignees.personId }).from(shiftAssignees).where(eq(shiftAssignees.shiftId, row.id)).all().map(r => r.id)
    changed.push({ id: row.id, assigneeIds, flaggedNow: check.flagged && !row.flagged })
  }
  return changed
}

function requireSiteRow(tx: Tx, id: number): Site {
  const row = tx.select().from(sites).where(eq(sites.id, id)).get()
  if (!row) throw notFound('Site')
  return row
}

/** Creates a site, with its audit entry; a name another site has already (any case) is a 409. */
export function createSite(db: AppDatabase, actorId: number, body: typeof sites.$inferInsert): Site {
  return db.transaction((tx) => {
    requireFreeSiteName(tx, body.name, 0)
    const row = tx.insert(sites).values(body).returning().get()
    recordAudit(tx, actorId, 'site.create', 'site', row.id, { name: row.name })
    return row
  })
}

/** Edits a site; new coordinates or zone re-check its shifts in the same transaction. */
export function updateSite(db: AppDatabase, actorId: number, id: number, patch: SitePatch): Site {
  const result = db.transaction((tx) => {
    const before = requireSiteRow(tx, id)
    if (patch.name !== undefined) requireFreeSiteName(tx, patch.name, id)
    const moved = (patch.latitude !== undefined && patch.latitude !== before.latitude)
      || (patch.longitude !== undefined && patch.longitude !== before.longitude)
    const rezoned = patch.timezone !== undefined && patch.timezone !== before.timezone
    const site = tx.update(sites).set({ ...patch, updatedAt: nowDate() }).where(eq(sites.id, id)).returning().get()
    const changed = moved || rezoned ? recheckSiteShifts(tx, site, moved) : []
    recordAudit(tx, actorId, 'site.update', 'site', id, {
      before: { name: before.name, latitude: before.latitude, longitude: before.longitude, timezone: before.timezone },
      patch,
      rechecked: changed.map(c => c.id),
      newlyFlagged: changed.filter(c => c.flaggedNow).map(c => c.id)
    })
    return { site, changed }
  })
  for (const shift of result.changed) {
    announceShiftChange({ kind: 'updated', shiftId: shift.id, actorId, previousAssigneeIds: shift.assigneeIds, material: true })
  }
  return result.site
}

/** Archives a site (hidden from the site list, closed to new shifts) or brings it back. */
export function archiveSite(db: AppDatabase, actorId: number, id: number, archived: boolean): Site {
  return db.transaction((tx) => {
    const before = requireSiteRow(tx, id)
    // archiving twice keeps the first date
    const archivedAt = archived ? (before.archivedAt ?? nowDate()) : null
    const site = tx.update(sites).set({ archivedAt, updatedAt: nowDate() }).where(eq(sites.id, id)).returning().get()
    recordAudit(tx, actorId, archived ? 'site.archive' : 'site.unarchive', 'site', id, { name: site.name })
    return site
  })
}
