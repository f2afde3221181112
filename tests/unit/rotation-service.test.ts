// Rotations on a fresh SQLite database, as the routes run them. References: the sun from
// astronomy-engine 2.1.19 (geometric altitude of the centre, USNO band thresholds, docs/light-model.md); the
// wall clock from the tz data through Intl (Arctic/Longyearbyen: EU summer time, Directive
// 2000/84/EC, forward 28 March 2027 and back 31 October 2027, 01:00 UTC).
import { afterEach, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { auditLog, people, rotations, settings, shifts, sites } from '../../server/db/schema'
import { createRotation, loadRotationReply, previewRotation, reviewRotation, RotationBodySchema, updateRotationFrom, cancelRotationFrom } from '../../server/services/rotations'
import { buildReviewQueue, ReviewBodySchema, ReviewQueueQuerySchema } from '../../server/services/reviews'
import { createShift, updateShift } from '../../server/services/shift-writes'
import { findShiftView } from '../../server/services/shifts'
import { ShiftBodySchema } from '../../shared/schemas/shift'
import { copySiteWeek } from '../../server/services/week-copy'
import { BANDS_MEETING_REQUIREMENT } from '../../shared/light'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'
import { ReferenceTimeline, REFERENCE_THRESHOLDS, referenceAltitude, referenceMinutesOutside } from '../support/sun-reference'

const HOUR_MS = 3_600_000
// an invented site at 76.4°N on Svalbard's clock
const SITE = { name: 'Kvitneset Test Camp', latitude: 76.4, longitude: 16.2, timezone: 'Arctic/Longyearbyen' }

afterEach(() => removeTestDatabases())

function setup() {
  const db = createTestDatabase('gloamline-rotation-')
  const site = db.insert(sites).values(SITE).returning().get()
  const [coord, safety, ana, ben] = db.insert(people).values([
    { name: 'Cora Plan', email: 'cora@rotation.test', role: 'coordinator' },
    { name: 'Sam Watch', email: 'sam@rotation.test', role: 'safety' },
    { name: 'Ana Field', email: 'ana@rotation.test', role: 'crew' },
    { name: 'Ben Field', email: 'ben@rotation.test', role: 'crew' }
  ]).returning().all()
  return { db, site, coord: coord!, safety: safety!, ana: ana!, ben: ben! }
}

function intlWall(ms: number) {
  const p = Object.fromEntries(new Intl.DateTimeFormat('en-CA', { timeZone: SITE.timezone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(ms).map(x => [x.type, x.value]))
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute}`
}

// Minutes of [start, end) below daylight by astronomy-engine, with the allowance the light engine's
// own tests use where the sun skims a threshold: suncalc and astronomy-engine differ by up to ~0.016°
// in altitude (docs/references.md), worth more than a minute when the sun barely moves.
function referenceCheck(startMs: number, endMs: number) {
  const timeline = new ReferenceTimeline(SITE.latitude, SITE.longitude, startMs - HOUR_MS, endMs + HOUR_MS)
  const minutes = referenceMinutesOutside(timeline, startMs, endMs, BANDS_MEETING_REQUIREMENT.daylight)
  const crossings = timeline.crossings.filter(c => c.ms > startMs && c.ms < endMs && REFERENCE_THRESHOLDS[c.level] === -0.833)
  const allowance = crossings.reduce((sum, c) => {
    const perMinute = Math.abs(referenceAltitude(c.ms + 30_000, SITE.latitude, SITE.longitude) - referenceAltitude(c.ms - 30_000, SITE.latitude, SITE.longitude))
    return sum + Math.min(30, 0.02 / perMinute)
  }, 1)
  return { minutes, allowance }
}

const body = (over: Record<string, unknown>) => RotationBodySchema.parse({
  title: 'Weather mast service', light: 'daylight', from: '2027-10-18', to: '2027-11-21',
  startTime: '09:00', endTime: '15:00', onDays: 4, offDays: 3, ...over
})

describe('a rotation on a database', () => {
  it('makes a 4-on/3-off rotation through the autumn change into polar night: wall-clock times and each light check against astronomy-engine', () => {
    const { db, site, coord, ana, ben } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id, assigneeIds: [ana.id, ben.id] }))
    const reply = loadRotationReply(db, id)
    expect(reply.shifts).toHaveLength(20)
    for (const s of reply.shifts) {
      const date = s.start.slice(0, 10)
      expect(intlWall(Date.parse(s.start))).toBe(`${date} 09:00`)
      expect(intlWall(Date.parse(s.end))).toBe(`${date} 15:00`)
      expect(s.start.slice(19)).toBe(date < '2027-10-31' ? '+02:00' : '+01:00')
      expect(s.rotationId).toBe(id)
      expect(s.assigneeIds.sort()).toEqual([ana.id, ben.id].sort())
      const ref = referenceCheck(Date.parse(s.start), Date.parse(s.end))
      expect(Math.abs(s.lightCheck.minutesBelow - ref.minutes)).toBeLessThanOrEqual(ref.allowance)
      expect(s.reviewState).toBe(s.lightCheck.flagged ? 'pending' : 'not-needed')
    }
    // into polar night: the last shifts are wholly without daylight (6 h = 360 minutes short)
    expect(reply.shifts.at(-1)!.lightCheck.minutesBelow).toBe(360)
    expect(reply.summary.shifts).toBe(20)
    expect(reply.summary.flagged).toBe(reply.shifts.filter(s => s.lightCheck.flagged).length)
    expect(reply.summary.minutesBelow).toBe(reply.shifts.reduce((n, s) => n + s.lightCheck.minutesBelow, 0))
    expect(db.select().from(auditLog).where(eq(auditLog.action, 'rotation.create')).all()).toHaveLength(1)
  })

  it('previews the same shifts and light without writing anything, worst days first', () => {
    const { db, site, coord } = setup()
    const input = body({ siteId: site.id })
    const preview = previewRotation(db, input)
    expect(db.select().from(shifts).all()).toHaveLength(0)
    expect(db.select().from(rotations).all()).toHaveLength(0)
    const id = createRotation(db, coord, input)
    const stored = loadRotationReply(db, id)
    expect(preview.shifts.map(s => [s.start, s.end, s.minutesBelow])).toEqual(stored.shifts.map(s => [s.start, s.end, s.lightCheck.minutesBelow]))
    expect(preview.summary.flagged).toBe(stored.summary.flagged)
    const worst = preview.worstDays.map(d => d.minutesBelow)
    expect(worst).toEqual([...worst].sort((a, b) => b - a))
  })

  it('warns of a night shift rotation\'s own short rest between days, per shift', () => {
    const { db, site, ana } = setup()
    // 20:00–08:00 daily leaves 12 h between shifts: with a 14 h rest rule in the work rules that is short
    db.insert(settings).values({ key: 'work-rules', value: { minRestHours: 14, maxShiftHours: 13 } }).run()
    const preview = previewRotation(db, body({ siteId: site.id, from: '2027-11-01', to: '2027-11-04', startTime: '20:00', endTime: '08:00', onDays: 1, offDays: 0, assigneeIds: [ana.id] }))
    expect(preview.shifts).toHaveLength(4)
    expect(preview.shifts.every(s => s.conflicts.some(c => c.kind === 'rest'))).toBe(true)
  })

  it('one decision approves every waiting shift; a later change to one shift re-opens that shift alone', () => {
    const { db, site, coord, safety, ana } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id, assigneeIds: [ana.id] }))
    const waiting = loadRotationReply(db, id).shifts.filter(s => s.reviewState === 'pending')
    expect(waiting.length).toBeGreaterThan(5)
    const decision = ReviewBodySchema.parse({ decision: 'approved', mitigations: ['check-in-interval:30'] })
    expect(reviewRotation(db, safety, id, decision).decided).toBe(waiting.length)
    const after = loadRotationReply(db, id).shifts
    expect(after.filter(s => s.reviewState === 'approved')).toHaveLength(waiting.length)
    const one = waiting[3]!
    updateShift(db, coord, one.id, { start: new Date(Date.parse(one.start) - HOUR_MS).toISOString() })
    const reopened = loadRotationReply(db, id).shifts.filter(s => s.reviewState === 'pending')
    expect(reopened.map(s => s.id)).toEqual([one.id])
    expect(reviewRotation(db, safety, id, decision).decided).toBe(1)
  })

  it('shows a rotation in the review queue as one item, worst day first; a changed shift comes back alone', () => {
    const { db, site, coord, safety, ana } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id, assigneeIds: [ana.id] }))
    const before = Date.parse('2027-10-01T00:00:00Z')
    const queue = buildReviewQueue(db, ReviewQueueQuerySchema.parse({}), before)
    const waiting = loadRotationReply(db, id).shifts.filter(s => s.reviewState === 'pending')
    expect(queue.items).toHaveLength(0)
    expect(queue.rotations).toHaveLength(1)
    const group = queue.rotations[0]!
    expect(group.shiftIds.sort()).toEqual(waiting.map(s => s.id).sort())
    const minutes = [...group.days.map(d => d.minutesBelow), ...group.moreDays.map(d => d.minutesBelow)]
    expect(minutes).toEqual([...minutes].sort((a, b) => b - a))
    expect(group.summary.worstMinutesBelow).toBe(Math.max(...waiting.map(s => s.lightCheck.minutesBelow)))
    expect(group.days[0]!.weather).toBeDefined()
    reviewRotation(db, safety, id, ReviewBodySchema.parse({ decision: 'approved', mitigations: ['check-in-interval:30'] }))
    // the last day is in polar night: an hour earlier it is still short of daylight, so it waits again
    const one = waiting.at(-1)!
    updateShift(db, coord, one.id, { start: new Date(Date.parse(one.start) - HOUR_MS).toISOString() })
    const after = buildReviewQueue(db, ReviewQueueQuerySchema.parse({}), before)
    expect(after.rotations).toHaveLength(0)
    expect(after.items.map(i => i.shift.id)).toEqual([one.id])
  })

  it('decides only the shifts at the versions the reviewer saw; one changed meanwhile keeps waiting', () => {
    const { db, site, coord, safety } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id }))
    const queue = buildReviewQueue(db, ReviewQueueQuerySchema.parse({}), Date.parse('2027-10-01T00:00:00Z'))
    const seen = queue.rotations[0]!.seen
    const changed = loadRotationReply(db, id).shifts.find(s => s.id === seen.at(-1)!.id)!
    updateShift(db, coord, changed.id, { start: new Date(Date.parse(changed.start) - HOUR_MS).toISOString() })
    const result = reviewRotation(db, safety, id, ReviewBodySchema.parse({ decision: 'approved', mitigations: ['portable-lighting'] }), seen)
    expect(result.decided).toBe(seen.length - 1)
    expect(result.stillWaiting).toBe(1)
    expect(loadRotationReply(db, id).shifts.filter(s => s.reviewState === 'pending').map(s => s.id)).toEqual([changed.id])
  })

  it('changes shifts from a date on and keeps earlier ones; cancels from a date on', () => {
    const { db, site, coord } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id }))
    const before = loadRotationReply(db, id).shifts
    const { changed } = updateRotationFrom(db, coord, id, { fromDate: '2027-11-01', startTime: '10:00' })
    const after = loadRotationReply(db, id).shifts
    expect(changed).toBe(before.filter(s => s.start.slice(0, 10) >= '2027-11-01').length)
    for (const [i, s] of after.entries()) {
      const date = s.start.slice(0, 10)
      expect(intlWall(Date.parse(s.start))).toBe(`${date} ${date >= '2027-11-01' ? '10:00' : '09:00'}`)
      if (date < '2027-11-01') expect(s.version).toBe(before[i]!.version)
    }
    const { cancelled } = cancelRotationFrom(db, coord, id, '2027-11-15')
    const final = loadRotationReply(db, id)
    expect(cancelled).toBe(final.shifts.filter(s => s.cancelled).length)
    expect(final.shifts.filter(s => s.cancelled).every(s => s.start.slice(0, 10) >= '2027-11-15')).toBe(true)
    expect(final.summary.shifts).toBe(final.shifts.length - cancelled)
  })

  it('gives each shift the same review reasons as the same shift made on its own (one person alone in polar night, lit work area)', () => {
    const { db, site, coord, ana } = setup()
    const id = createRotation(db, coord, body({ siteId: site.id, light: 'any', from: '2027-12-01', to: '2027-12-04', onDays: 1, offDays: 0, assigneeIds: [ana.id] }))
    const rotationShifts = loadRotationReply(db, id).shifts
    const single = createShift(db, coord, ShiftBodySchema.parse({ siteId: site.id, title: 'Alone', light: 'any', start: '2027-12-02T09:00', end: '2027-12-02T15:00', assigneeIds: [ana.id] }))
    const alone = findShiftView(db, single.id)!
    for (const s of rotationShifts) {
      // docs/api.md: lone = exactly one person and any minute with the sun below −6°; in December at 76°N every minute is
      expect(s.reviewReasons).toEqual(alone.reviewReasons)
      expect(s.reviewReasons).toContain('lone')
      expect(s.reviewState).toBe('pending')
      expect(s.lightCheck.flagged).toBe(false)
    }
  })

  it('copies a week into the next ones on the same wall-clock times, across the autumn change; an empty week is refused naming weekStart', () => {
    const { db, site, coord, ana } = setup()
    // Mon 25 Oct 2027 08:00–12:00 (+02:00) and a night shift Thu 28 Oct 22:00 – Fri 06:00
    const day = createShift(db, coord, ShiftBodySchema.parse({ siteId: site.id, title: 'Day task', light: 'daylight', start: '2027-10-25T08:00', end: '2027-10-25T12:00', assigneeIds: [ana.id] }))
    createShift(db, coord, ShiftBodySchema.parse({ siteId: site.id, title: 'Night task', light: 'any', start: '2027-10-28T22:00', end: '2027-10-29T06:00', assigneeIds: [] }))
    const { created, shiftIds } = copySiteWeek(db, coord, { siteId: site.id, weekStart: '2027-10-25', weeks: 2 })
    expect(created).toBe(4)
    const copies = shiftIds.map(id => findShiftView(db, id)!)
    const walls = copies.map(c => `${c.title}: ${intlWall(Date.parse(c.start))} – ${intlWall(Date.parse(c.end))}`).sort()
    expect(walls).toEqual([
      'Day task: 2027-11-01 08:00 – 2027-11-01 12:00',
      'Day task: 2027-11-08 08:00 – 2027-11-08 12:00',
      'Night task: 2027-11-04 22:00 – 2027-11-05 06:00',
      'Night task: 2027-11-11 22:00 – 2027-11-12 06:00'
    ])
    // after the change the offset is +01:00 (tz data via Intl), so the copies are not simply 7 × 24 h later
    expect(Date.parse(copies[0]!.start) - Date.parse(findShiftView(db, day.id)!.start)).toBe(7 * 24 * HOUR_MS + HOUR_MS)
    expect(copies.filter(c => c.title === 'Day task').every(c => c.assigneeIds[0] === ana.id)).toBe(true)
    for (const c of copies) {
      const ref = referenceCheck(Date.parse(c.start), Date.parse(c.end))
      if (c.light === 'daylight') expect(Math.abs(c.lightCheck.minutesBelow - ref.minutes)).toBeLessThanOrEqual(ref.allowance)
    }
    expect(() => copySiteWeek(db, coord, { siteId: site.id, weekStart: '2027-12-06', weeks: 1 })).toThrow(/weekStart/)
  })

  it('writes nothing when a person is unknown', () => {
    const { db, site, coord } = setup()
    expect(() => createRotation(db, coord, body({ siteId: site.id, assigneeIds: [999] }))).toThrow(/assigneeIds/)
    expect(db.select().from(shifts).all()).toHaveLength(0)
    expect(db.select().from(rotations).all()).toHaveLength(0)
  })
})
