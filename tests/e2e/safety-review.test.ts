import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { TEST_CLOCK } from '../support/clock'
import { createDarkShift, createDarkSite, dateFromToday, findPeopleIds, queryDatabase, startSafetyWorld, type SafetyWorld } from '../support/safety-fixtures'

let world: SafetyWorld
let siteId: number
let crewIds: number[]

beforeAll(async () => {
  // midnight sun in the north; the test site at 60° N still has no civil light at midnight UTC
  world = await startSafetyWorld({}, TEST_CLOCK.fridayMidnightSun)
  siteId = (await createDarkSite(world.coordinator, 'Invented Test Ridge')).id
  crewIds = (await findPeopleIds(world.coordinator)).crew
})
afterAll(async () => {
  await world?.stop()
})

function countRows(shiftId: number) {
  const reviews = queryDatabase<{ n: number }>(world.server, 'select count(*) as n from reviews where shift_id = ?', shiftId)[0]!.n
  const audits = queryDatabase<{ n: number }>(world.server, 'select count(*) as n from audit_log where entity = ? and entity_id = ? and action = ?', 'shift', shiftId, 'shift.review')[0]!.n
  return { reviews, audits }
}

const APPROVAL = { decision: 'approved', mitigations: ['portable-lighting', 'check-in-interval'], checkInMinutes: 30, note: 'Lights at the laydown area.' }

describe('who may decide', () => {
  it('refuses coordinators and crew with 403, and writes nothing', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 2, assigneeIds: crewIds.slice(0, 2) })
    expect(shift.lightCheck.flagged).toBe(true)
    expect(shift.reviewState).toBe('pending')
    expect((await world.coordinator.post(`/api/shifts/${shift.id}/review`, APPROVAL)).status).toBe(403)
    expect((await world.crew.post(`/api/shifts/${shift.id}/review`, APPROVAL)).status).toBe(403)
    expect(countRows(shift.id)).toEqual({ reviews: 0, audits: 0 })
    expect((await world.safety.get(`/api/shifts/${shift.id}`)).body.reviewState).toBe('pending')
  })
})

describe('recording a decision', () => {
  it('approves with mitigations: the review, the shift state and the audit entry land together', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 3, assigneeIds: crewIds.slice(0, 2) })
    const reply = await world.safety.post(`/api/shifts/${shift.id}/review`, { ...APPROVAL, version: shift.version })
    expect(reply.status).toBe(201)
    expect(reply.body).toMatchObject({ reviewState: 'approved', shiftVersion: shift.version })
    const rows = queryDatabase<{ decision: string, mitigations: string, note: string, shift_version: number }>(world.server, 'select decision, mitigations, note, shift_version from reviews where shift_id = ?', shift.id)
    expect(rows).toEqual([{ decision: 'approved', mitigations: JSON.stringify(['portable-lighting', 'check-in-interval:30']), note: 'Lights at the laydown area.', shift_version: shift.version }])
    const audits = queryDatabase<{ actor_id: number, detail: string }>(world.server, 'select actor_id, detail from audit_log where entity_id = ? and action = ?', shift.id, 'shift.review')
    expect(audits).toHaveLength(1)
    const me = (await world.safety.get('/api/auth/me')).body
    expect(audits[0]!.actor_id).toBe(me.user.id)
    expect(JSON.parse(audits[0]!.detail)).toMatchObject({ decision: 'approved', mitigations: ['portable-lighting', 'check-in-interval:30'], previousState: 'pending' })
    // the coordinator sees the decision on the shift
    const seen = (await world.coordinator.get(`/api/shifts/${shift.id}`)).body
    expect(seen.reviewState).toBe('approved')
    expect(seen.review).toMatchObject({ decision: 'approved', mitigations: ['portable-lighting', 'check-in-interval:30'], reviewerName: 'Tomas Reyes', current: true })
    const history = (await world.coordinator.get(`/api/shifts/${shift.id}/reviews`)).body
    expect(history).toMatchObject([{ decision: 'approved', current: true, shiftVersion: shift.version }])
  })

  const INVALID: [string, Record<string, unknown>, string][] = [
    ['an empty mitigation', { decision: 'approved', mitigations: ['   '], note: '' }, 'mitigations.0'],
    ['a mitigation of more text than a note', { decision: 'approved', mitigations: ['x'.repeat(5000)], note: '' }, 'mitigations.0'],
    ['a check-in without its minutes', { decision: 'approved', mitigations: ['check-in-interval'], note: '' }, 'mitigations.0'],
    ['a check-in interval out of range', { decision: 'approved', mitigations: ['check-in-interval'], checkInMinutes: 2, note: '' }, 'checkInMinutes'],
    ['a rejection without a reason', { decision: 'rejected', mitigations: [], note: '  ' }, 'note'],
    ['a request for changes without the changes', { decision: 'changes-requested', mitigations: [] }, 'note'],
    ['an unknown decision', { decision: 'maybe', mitigations: [], note: 'x' }, 'decision'],
    ['mitigations that are not a list', { decision: 'approved', mitigations: 'portable-lighting', note: '' }, 'mitigations']
  ]
  for (const [what, body, field] of INVALID) {
    it(`refuses ${what} with 400 naming ${field}, and writes neither a review nor an audit entry`, async () => {
      const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 4, assigneeIds: crewIds.slice(0, 2) })
      const reply = await world.safety.post(`/api/shifts/${shift.id}/review`, body)
      expect(reply.status).toBe(400)
      expect(reply.body.data.issues.map((i: { field: string }) => i.field)).toContain(field)
      expect(countRows(shift.id)).toEqual({ reviews: 0, audits: 0 })
      expect((await world.safety.get(`/api/shifts/${shift.id}`)).body.reviewState).toBe('pending')
    })
  }

  it('keeps a mitigation in the reviewer\'s own words verbatim, as docs/api.md takes any list of strings', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 4, assigneeIds: crewIds.slice(0, 2) })
    const reply = await world.safety.post(`/api/shifts/${shift.id}/review`, { decision: 'approved', mitigations: ['Head torches for all', 'portable-lighting'], note: '' })
    expect(reply.status).toBe(201)
    expect((await world.coordinator.get(`/api/shifts/${shift.id}`)).body.review.mitigations).toEqual(['Head torches for all', 'portable-lighting'])
  })

  it('refuses a body that is not JSON with 400', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 4, assigneeIds: crewIds.slice(0, 2) })
    const reply = await world.safety.request('POST', `/api/shifts/${shift.id}/review`, undefined, '{"decision": ')
    expect(reply.status).toBe(400)
    expect(countRows(shift.id)).toEqual({ reviews: 0, audits: 0 })
  })

  it('rejects with a reason and sends back with the changes asked for', async () => {
    const a = await createDarkShift(world.coordinator, siteId, { daysAhead: 5, assigneeIds: crewIds.slice(0, 2) })
    const b = await createDarkShift(world.coordinator, siteId, { daysAhead: 5, assigneeIds: crewIds.slice(2, 4), title: 'Second invented task' })
    expect((await world.safety.post(`/api/shifts/${a.id}/review`, { decision: 'rejected', mitigations: [], note: 'No lighting plan for the ridge.' })).status).toBe(201)
    expect((await world.safety.post(`/api/shifts/${b.id}/review`, { decision: 'changes-requested', mitigations: ['two-person-minimum', 'other: spotter at the edge'], note: 'Move it into daylight.' })).status).toBe(201)
    expect((await world.safety.get(`/api/shifts/${a.id}`)).body.reviewState).toBe('rejected')
    expect((await world.safety.get(`/api/shifts/${b.id}`)).body.review).toMatchObject({ decision: 'changes-requested', mitigations: ['two-person-minimum', 'other:spotter at the edge'] })
    const sentBack = (await world.safety.get(`/api/review/queue?state=changes-requested&siteId=${siteId}`)).body
    expect(sentBack.items.map((i: { shift: { id: number } }) => i.shift.id)).toContain(b.id)
    const rejected = (await world.safety.get(`/api/review/queue?state=rejected&siteId=${siteId}`)).body
    expect(rejected.items.map((i: { shift: { id: number } }) => i.shift.id)).toEqual([a.id])
  })

  it('answers 409 for a shift with no review reason, naming why', async () => {
    // the same site and hours, but a lit work area: nothing is below requirement (docs/light-model.md, "any")
    const start = dateFromToday(6)
    const lit = (await world.coordinator.post('/api/shifts', { siteId, title: 'Lit yard work', start: `${start}T23:00:00Z`, end: `${start}T23:30:00Z`, light: 'any', assigneeIds: crewIds.slice(0, 2) })).body
    expect(lit.reviewState).toBe('not-needed')
    const reply = await world.safety.post(`/api/shifts/${lit.id}/review`, APPROVAL)
    expect(reply.status).toBe(409)
    expect(reply.body.message).toContain('needs no review')
    expect(countRows(lit.id)).toEqual({ reviews: 0, audits: 0 })
  })

  it('answers 409 when the shift changed since the reviewer opened it', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 6, assigneeIds: crewIds.slice(0, 2) })
    const opened = (await world.safety.get(`/api/review/${shift.id}`)).body
    expect((await world.coordinator.patch(`/api/shifts/${shift.id}`, { assigneeIds: crewIds.slice(0, 3), version: shift.version })).status).toBe(200)
    const reply = await world.safety.post(`/api/shifts/${shift.id}/review`, { ...APPROVAL, version: opened.shift.version })
    expect(reply.status).toBe(409)
    expect(reply.body.data.currentVersion).toBe(shift.version + 1)
    expect(countRows(shift.id)).toEqual({ reviews: 0, audits: 0 })
  })

  it('answers 409 for a cancelled shift', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 6, assigneeIds: crewIds.slice(0, 2) })
    expect((await world.coordinator.delete(`/api/shifts/${shift.id}`)).status).toBeLessThan(300)
    const reply = await world.safety.post(`/api/shifts/${shift.id}/review`, APPROVAL)
    expect(reply.status).toBe(409)
    expect(reply.body.message).toContain('cancelled')
    expect(countRows(shift.id)).toEqual({ reviews: 0, audits: 0 })
  })

  it('answers 404 for a shift that does not exist', async () => {
    expect((await world.safety.post('/api/shifts/999999/review', APPROVAL)).status).toBe(404)
  })
})

describe('a change after a decision', () => {
  it('puts an approved shift back in the queue when its time or people change, marked changed since review', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 7, assigneeIds: crewIds.slice(0, 2), title: 'Reopened task' })
    await world.safety.post(`/api/shifts/${shift.id}/review`, APPROVAL)
    // a new title is not a material change: the approval stands
    const renamed = await world.coordinator.patch(`/api/shifts/${shift.id}`, { title: 'Reopened task (renamed)' })
    expect(renamed.body).toMatchObject({ reviewState: 'approved', review: { decision: 'approved', current: true } })
    // a later end is: the shift goes back to the queue
    const later = renamed.body.end.replace('T01:00:00', 'T01:30:00')
    const moved = await world.coordinator.patch(`/api/shifts/${shift.id}`, { end: later, version: renamed.body.version })
    expect(moved.status).toBe(200)
    expect(moved.body).toMatchObject({ reviewState: 'pending', review: { decision: 'approved', current: false } })
    const queue = (await world.safety.get(`/api/review/queue?siteId=${siteId}`)).body
    const item = queue.items.find((i: { shift: { id: number } }) => i.shift.id === shift.id)
    expect(item.changedSinceReview).toBe(true)
    expect(queue.counts.changedSinceReview).toBeGreaterThanOrEqual(1)
  })

  it('reopens an approved shift when its light requirement or its site changes', async () => {
    const a = await createDarkShift(world.coordinator, siteId, { daysAhead: 8, assigneeIds: crewIds.slice(0, 2), light: 'civil' })
    await world.safety.post(`/api/shifts/${a.id}/review`, APPROVAL)
    expect((await world.coordinator.patch(`/api/shifts/${a.id}`, { light: 'daylight' })).body.reviewState).toBe('pending')
    const other = await createDarkSite(world.coordinator, 'Invented Second Ridge')
    const b = await createDarkShift(world.coordinator, siteId, { daysAhead: 8, assigneeIds: crewIds.slice(2, 4) })
    await world.safety.post(`/api/shifts/${b.id}/review`, APPROVAL)
    expect((await world.coordinator.patch(`/api/shifts/${b.id}`, { siteId: other.id })).body.reviewState).toBe('pending')
  })

  it('reopens an approved shift when its people change', async () => {
    const shift = await createDarkShift(world.coordinator, siteId, { daysAhead: 8, assigneeIds: crewIds.slice(0, 2) })
    await world.safety.post(`/api/shifts/${shift.id}/review`, APPROVAL)
    const changed = await world.coordinator.patch(`/api/shifts/${shift.id}`, { assigneeIds: crewIds.slice(0, 1) })
    expect(changed.body.reviewState).toBe('pending')
  })
})

describe('the review queue', () => {
  it('lists waiting flagged shifts soonest first, with light strip, cold figures, people and cautions', async () => {
    const alone = await createDarkShift(world.coordinator, siteId, { daysAhead: 9, assigneeIds: crewIds.slice(0, 1), title: 'Alone task' })
    const nobody = await createDarkShift(world.coordinator, siteId, { daysAhead: 10, assigneeIds: [], title: 'Unstaffed task' })
    await world.safety.post(`/api/sites/${siteId}/forecast/refresh`)
    const queue = (await world.safety.get(`/api/review/queue?siteId=${siteId}&limit=200`)).body
    const starts = queue.items.map((i: { shift: { start: string } }) => Date.parse(i.shift.start))
    expect(starts).toEqual([...starts].sort((a, b) => a - b))
    expect(queue.items.every((i: { shift: { reviewState: string } }) => i.shift.reviewState === 'pending')).toBe(true)
    const a = queue.items.find((i: { shift: { id: number } }) => i.shift.id === alone.id)
    expect(a.crew).toMatchObject({ count: 1, alone: true })
    expect(a.cautions.map((c: { key: string }) => c.key)).toEqual(expect.arrayContaining(['working-alone', 'below-light']))
    expect(a.minutesBelow).toBe(alone.lightCheck.minutesBelow)
    // the strip covers the whole shift, with times in the site's zone (UTC here)
    expect(a.light.strip[0].start).toBe(a.shift.start)
    expect(a.light.strip.at(-1).end).toBe(a.shift.end)
    expect(a.light.strip.reduce((sum: number, s: { minutes: number }) => sum + s.minutes, 0)).toBe(120)
    expect(a.weather.basis).toBe('forecast')
    expect(a.weather.figures).toMatchObject({ coldestTemperatureC: expect.any(Number), warmup: { stopWork: expect.any(Boolean) } })
    const n = queue.items.find((i: { shift: { id: number } }) => i.shift.id === nobody.id)
    expect(n.cautions.map((c: { key: string }) => c.key)).toContain('nobody-assigned')
  })

  it('is readable by coordinators, not by crew', async () => {
    expect((await world.coordinator.get('/api/review/queue')).status).toBe(200)
    expect((await world.crew.get('/api/review/queue')).status).toBe(403)
    expect((await world.crew.get('/api/review/1')).status).toBe(403)
  })

  it('answers 400 naming the field for a bad filter', async () => {
    const reply = await world.safety.get('/api/review/queue?state=whatever')
    expect(reply.status).toBe(400)
    expect(reply.body.data.issues[0].field).toBe('state')
    expect((await world.safety.get('/api/review/queue?limit=0')).body.data.issues[0].field).toBe('limit')
  })
})
