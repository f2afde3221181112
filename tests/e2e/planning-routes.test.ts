import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

// The planning routes on the built server: crews, blocked spans, work rules, conflict warnings with
// override reasons, the no-write shift check, cancelling, stale edits, site edits that re-check
// shifts, archiving and the zone suggestion. People and sites are made here, on dates far from the
// seeded demo weeks, so the demo's own shifts cannot disturb the figures.
let server: AppServer
let coordinator: ApiClient
let crew: ApiClient
const ids: Record<string, number> = {}

function readDb() {
  return new Database(server.databasePath, { readonly: true, fileMustExist: true })
}

function countRows(table: string) {
  const db = readDb()
  try {
    return (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n
  } finally {
    db.close()
  }
}

function auditEntries(action: string, entityId: number) {
  const db = readDb()
  try {
    return (db.prepare('select detail from audit_log where action = ? and entity_id = ?').all(action, entityId) as { detail: string }[]).map(r => JSON.parse(r.detail))
  } finally {
    db.close()
  }
}

async function addPerson(name: string) {
  const email = `${name.toLowerCase().replace(/\s+/g, '.')}@planning.gloamline.test`
  const reply = await coordinator.post('/api/people', { name, email, role: 'crew' })
  expect(reply.status).toBe(201)
  return reply.body.id as number
}

async function addSite(name: string, latitude: number, longitude: number, timezone: string) {
  const reply = await coordinator.post('/api/sites', { name, latitude, longitude, timezone })
  expect(reply.status).toBe(201)
  return reply.body.id as number
}

beforeAll(async () => {
  server = await startAppServer()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  crew = await signedInClient(server, 'crew@gloamline.test')
  ids.vigdis = await addPerson('Vigdis Test')
  ids.arnaq = await addPerson('Arnaq Test')
  ids.camp = await addSite('Planning Test Camp', 69.6496, 18.9560, 'Europe/Oslo')
})
afterAll(async () => {
  await server?.stop()
})

describe('crews', () => {
  it('creates a crew with members, lists it, and lets a person be in two crews', async () => {
    const first = await coordinator.post('/api/crews', { name: 'Scree crew', memberIds: [ids.vigdis, ids.arnaq] })
    expect(first.status).toBe(201)
    expect(first.body).toMatchObject({ name: 'Scree crew', members: expect.arrayContaining([expect.objectContaining({ id: ids.vigdis, name: 'Vigdis Test', role: 'crew' })]) })
    const second = await coordinator.post('/api/crews', { name: 'Moraine crew', memberIds: [ids.vigdis] })
    expect(second.status).toBe(201)
    const list = await crew.get('/api/crews')
    expect(list.status).toBe(200)
    const withVigdis = list.body.filter((c: any) => c.members.some((m: any) => m.id === ids.vigdis)).map((c: any) => c.name)
    expect(withVigdis.sort()).toEqual(['Moraine crew', 'Scree crew'])
    ids.scree = first.body.id
    ids.moraine = second.body.id
  })

  it('refuses a second crew of the same name in another case (409 naming name)', async () => {
    const reply = await coordinator.post('/api/crews', { name: 'scree CREW', memberIds: [] })
    expect(reply.status).toBe(409)
    expect(reply.body.data.issues[0].field).toBe('name')
  })

  it('refuses an unknown member with a 400 naming memberIds, and writes nothing', async () => {
    const before = countRows('crews')
    const reply = await coordinator.post('/api/crews', { name: 'Ghost crew', memberIds: [ids.vigdis, 999_999] })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('memberIds')
    expect(countRows('crews')).toBe(before)
  })

  it('renames a crew and replaces its members, then deletes it', async () => {
    const patched = await coordinator.patch(`/api/crews/${ids.moraine}`, { name: 'Moraine team', memberIds: [ids.arnaq] })
    expect(patched.status).toBe(200)
    expect(patched.body).toMatchObject({ name: 'Moraine team', members: [expect.objectContaining({ id: ids.arnaq })] })
    expect((await coordinator.delete(`/api/crews/${ids.moraine}`)).status).toBe(200)
    expect((await coordinator.get('/api/crews')).body.some((c: any) => c.id === ids.moraine)).toBe(false)
    expect((await coordinator.delete(`/api/crews/${ids.moraine}`)).status).toBe(404)
  })
})

describe('blocked spans (unavailability)', () => {
  it('reads whole days in UTC, the end day included', async () => {
    const reply = await coordinator.post('/api/unavailability', { personId: ids.arnaq, start: '2027-09-06', end: '2027-09-07', reason: 'Travel day' })
    expect(reply.status).toBe(201)
    expect(reply.body).toMatchObject({ personId: ids.arnaq, personName: 'Arnaq Test', start: '2027-09-06T00:00:00.000Z', end: '2027-09-08T00:00:00.000Z', reason: 'Travel day' })
    ids.travel = reply.body.id
  })

  it('lists spans by person and range', async () => {
    const hit = await crew.get(`/api/unavailability?personId=${ids.arnaq}&from=2027-09-07&to=2027-09-07`)
    expect(hit.body.map((s: any) => s.id)).toEqual([ids.travel])
    const miss = await crew.get(`/api/unavailability?personId=${ids.arnaq}&from=2027-09-08&to=2027-09-30`)
    expect(miss.body).toEqual([])
  })

  it('refuses an end before the start (400 naming end) and an unknown person (400 naming personId)', async () => {
    const backwards = await coordinator.post('/api/unavailability', { personId: ids.arnaq, start: '2027-09-10', end: '2027-09-09T00:00:00Z', reason: '' })
    expect(backwards.status).toBe(400)
    expect(backwards.body.message).toContain('end')
    const nobody = await coordinator.post('/api/unavailability', { personId: 999_999, start: '2027-09-10', end: '2027-09-11', reason: '' })
    expect(nobody.status).toBe(400)
    expect(nobody.body.message).toContain('personId')
  })

  it('warns about an assignee who is unavailable, without refusing the shift', async () => {
    const reply = await coordinator.post('/api/shifts', { siteId: ids.camp, title: 'Culvert survey', start: '2027-09-07T10:00', end: '2027-09-07T14:00', light: 'any', assigneeIds: [ids.arnaq] })
    expect(reply.status).toBe(201)
    expect(reply.body.conflicts).toEqual([expect.objectContaining({ kind: 'unavailable', personId: ids.arnaq, message: expect.stringContaining('Travel day') })])
    await coordinator.delete(`/api/shifts/${reply.body.id}`)
  })

  it('deletes a span', async () => {
    expect((await coordinator.delete(`/api/unavailability/${ids.travel}`)).status).toBe(200)
    expect((await coordinator.delete(`/api/unavailability/${ids.travel}`)).status).toBe(404)
  })
})

describe('work rules', () => {
  it('defaults to 11 h rest (EU Working Time Directive 2003/88/EC, art. 3) and 12 h shifts (common practice)', async () => {
    const reply = await crew.get('/api/settings/work-rules')
    expect(reply.body).toEqual({ minRestHours: 11, maxShiftHours: 12, reviewWindChillC: -27, weeklyLimitHours: null })
  })

  it('refuses a negative rest period with a 400 naming minRestHours', async () => {
    const reply = await coordinator.patch('/api/settings/work-rules', { minRestHours: -1 })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('minRestHours')
  })

  it('applies a changed maximum at once', async () => {
    const body = { siteId: ids.camp, title: 'Long haul', start: '2027-10-04T06:00', end: '2027-10-04T16:00', light: 'any', assigneeIds: [] }
    expect((await coordinator.post('/api/shifts/check', body)).body.conflicts).toEqual([])
    expect((await coordinator.patch('/api/settings/work-rules', { maxShiftHours: 8 })).body).toMatchObject({ minRestHours: 11, maxShiftHours: 8 })
    expect((await coordinator.post('/api/shifts/check', body)).body.conflicts.map((c: any) => c.kind)).toEqual(['long'])
    expect((await coordinator.patch('/api/settings/work-rules', { maxShiftHours: 12 })).body).toMatchObject({ minRestHours: 11, maxShiftHours: 12 })
  })
})

describe('conflict warnings and overrides', () => {
  it('creates a shift with a short rest anyway (201), with the warning in the reply and the list', async () => {
    const evening = await coordinator.post('/api/shifts', { siteId: ids.camp, title: 'Evening pump watch', start: '2027-10-11T18:00', end: '2027-10-11T23:00', light: 'any', assigneeIds: [ids.vigdis] })
    const early = await coordinator.post('/api/shifts', { siteId: ids.camp, title: 'Early valve check', start: '2027-10-12T05:00', end: '2027-10-12T09:00', light: 'any', assigneeIds: [ids.vigdis] })
    expect(early.status).toBe(201)
    // 23:00 to 05:00 is 6 h of rest, short of the 11 h of EU Working Time Directive 2003/88/EC art. 3
    expect(early.body.conflicts).toEqual([expect.objectContaining({ kind: 'rest', personId: ids.vigdis, otherShiftId: evening.body.id })])
    const list = await coordinator.get('/api/shifts?siteId=' + ids.camp + '&from=2027-10-11&to=2027-10-13')
    const listed = list.body.find((s: any) => s.id === evening.body.id)
    expect(listed.conflicts).toEqual([expect.objectContaining({ kind: 'rest', otherShiftId: early.body.id })])
    ids.evening = evening.body.id
    ids.early = early.body.id
  })

  it('stores the override reason and audits the warnings it overrode', async () => {
    const reason = 'Relief crew delayed by weather; evening watch cut short by agreement'
    const reply = await coordinator.patch(`/api/shifts/${ids.early}`, { overrideReason: reason, version: 1 })
    expect(reply.status).toBe(200)
    expect(reply.body.conflictOverride).toBe(reason)
    // a patch that leaves assigneeIds out keeps the people (it once emptied them)
    expect(reply.body.assigneeIds).toEqual([ids.vigdis])
    const audits = auditEntries('shift.conflict-override', ids.early!)
    expect(audits).toEqual([{ reason, conflicts: [expect.objectContaining({ kind: 'rest', personId: ids.vigdis })] }])
  })

  it('warns about an overlap, a long shift and a short rest in one reply', async () => {
    // 08:00–21:00 overlaps the 18:00 watch, lasts 13 h, and leaves 8 h before the 05:00 check
    const reply = await coordinator.post('/api/shifts', { siteId: ids.camp, title: 'Double booked', start: '2027-10-11T08:00', end: '2027-10-11T21:00', light: 'any', assigneeIds: [ids.vigdis], overrideReason: 'Testing every warning' })
    expect(reply.status).toBe(201)
    expect(reply.body.conflicts.map((c: any) => c.kind).sort()).toEqual(['long', 'overlap', 'rest'])
    expect(auditEntries('shift.conflict-override', reply.body.id)).toHaveLength(1)
    await coordinator.delete(`/api/shifts/${reply.body.id}`)
  })
})

describe('POST /api/shifts/check', () => {
  it('previews the light check, bands and time notes without writing', async () => {
    const before = countRows('shifts')
    // 2027-03-28 02:30 does not exist in Europe/Oslo (clocks go forward at 02:00)
    const reply = await coordinator.post('/api/shifts/check', { siteId: ids.camp, title: 'Preview', start: '2027-03-28T02:30', end: '2027-03-28T09:00', light: 'daylight', assigneeIds: [ids.vigdis] })
    expect(reply.status).toBe(200)
    expect(reply.body.lightCheck.flagged).toBe(true)
    expect(reply.body.bands[0].start).toBe('2027-03-28T03:30:00+02:00')
    expect(reply.body.bands.at(-1).end).toBe('2027-03-28T09:00:00+02:00')
    expect(reply.body.timeNotes).toEqual([expect.stringContaining('does not exist')])
    expect(reply.body.conflicts).toEqual([])
    expect(countRows('shifts')).toBe(before)
  })

  it('answers 400 naming the field for an unknown site and an end before the start', async () => {
    const base = { siteId: ids.camp, title: 'Preview', start: '2027-05-01T10:00', end: '2027-05-01T12:00', light: 'daylight', assigneeIds: [] }
    const site = await coordinator.post('/api/shifts/check', { ...base, siteId: 999_999 })
    expect(site.status).toBe(400)
    expect(site.body.message).toContain('siteId')
    const end = await coordinator.post('/api/shifts/check', { ...base, end: '2027-05-01T09:00' })
    expect(end.status).toBe(400)
    expect(end.body.message).toContain('end')
  })

  it('leaves the edited shift out of its own conflicts', async () => {
    const reply = await coordinator.post('/api/shifts/check', { shiftId: ids.evening, siteId: ids.camp, title: 'Evening pump watch', start: '2027-10-11T18:00', end: '2027-10-11T22:00', light: 'any', assigneeIds: [ids.vigdis] })
    expect(reply.body.conflicts.map((c: any) => [c.kind, c.otherShiftId])).toEqual([['rest', ids.early]])
  })
})

describe('stale edits and cancelling', () => {
  it('refuses a stale edit with 409 and keeps the newer copy', async () => {
    const current = (await coordinator.get(`/api/shifts/${ids.evening}`)).body
    expect((await coordinator.patch(`/api/shifts/${ids.evening}`, { title: 'Renamed first', version: current.version })).status).toBe(200)
    const stale = await coordinator.patch(`/api/shifts/${ids.evening}`, { title: 'Renamed from a stale copy', version: current.version })
    expect(stale.status).toBe(409)
    expect((await coordinator.get(`/api/shifts/${ids.evening}`)).body.title).toBe('Renamed first')
  })

  it('refuses a cancel from a stale copy (409), then cancels: version + 1, out of lists and conflicts', async () => {
    const current = (await coordinator.get(`/api/shifts/${ids.evening}`)).body
    expect((await coordinator.delete(`/api/shifts/${ids.evening}?version=${current.version - 1}`)).status).toBe(409)
    const cancelled = await coordinator.delete(`/api/shifts/${ids.evening}?version=${current.version}`)
    expect(cancelled.status).toBe(200)
    expect(cancelled.body).toMatchObject({ id: ids.evening, cancelled: true, version: current.version + 1 })
    const list = await coordinator.get('/api/shifts?siteId=' + ids.camp + '&from=2027-10-11&to=2027-10-13')
    expect(list.body.map((s: any) => s.id)).toEqual([ids.early])
    expect(list.body[0].conflicts).toEqual([])
    expect(auditEntries('shift.cancel', ids.evening!)).toHaveLength(1)
  })

  it('refuses to cancel twice or to edit a cancelled shift (409)', async () => {
    expect((await coordinator.delete(`/api/shifts/${ids.evening}`)).status).toBe(409)
    expect((await coordinator.patch(`/api/shifts/${ids.evening}`, { title: 'Back again' })).status).toBe(409)
  })
})

describe('site edits re-check the shifts', () => {
  it('flags a December daylight shift when the site moves from 60° N to 78° N (polar night)', async () => {
    // 11:00–13:00 on 14 Dec is daylight at 60.39° N (the sun is up about 09:15–15:15 there) and polar
    // night at 78.22° N (no sunrise from late October to mid February): USNO sunrise tables, from memory;
    // the light engine's accuracy itself is checked against astronomy-engine elsewhere.
    const siteId = await addSite('Planning Move Test', 60.3913, 5.3221, 'Europe/Oslo')
    const shift = await coordinator.post('/api/shifts', { siteId, title: 'Mast inspection', start: '2027-12-14T11:00', end: '2027-12-14T13:00', light: 'daylight', assigneeIds: [] })
    expect(shift.body).toMatchObject({ lightCheck: { flagged: false, minutesBelow: 0 }, reviewState: 'not-needed' })
    const moved = await coordinator.patch(`/api/sites/${siteId}`, { latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen' })
    expect(moved.status).toBe(200)
    expect(moved.body).toMatchObject({ latitude: 78.2232, timezone: 'Arctic/Longyearbyen' })
    const after = (await coordinator.get(`/api/shifts/${shift.body.id}`)).body
    expect(after).toMatchObject({ lightCheck: { flagged: true, minutesBelow: 120 }, reviewState: 'pending', version: shift.body.version + 1 })
    expect(after.start).toBe('2027-12-14T11:00:00+01:00')
  })

  it('leaves checks and versions alone when only the name or notes change, and refuses a taken name (409)', async () => {
    const siteId = await addSite('Planning Rename Test', 69.2198, -51.0986, 'America/Nuuk')
    const shift = await coordinator.post('/api/shifts', { siteId, title: 'Line walk', start: '2027-06-01T10:00', end: '2027-06-01T12:00', light: 'daylight', assigneeIds: [] })
    expect((await coordinator.patch(`/api/sites/${siteId}`, { notes: 'Helicopter pad moved north' })).body.notes).toBe('Helicopter pad moved north')
    expect((await coordinator.get(`/api/shifts/${shift.body.id}`)).body.version).toBe(shift.body.version)
    const taken = await coordinator.patch(`/api/sites/${siteId}`, { name: 'planning test camp' })
    expect(taken.status).toBe(409)
    expect(taken.body.data.issues[0].field).toBe('name')
  })

  it('refuses a bad latitude with a 400 naming it, changing nothing', async () => {
    const reply = await coordinator.patch(`/api/sites/${ids.camp}`, { latitude: 91 })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('latitude')
    expect((await coordinator.get(`/api/sites/${ids.camp}`)).body.latitude).toBe(69.6496)
  })
})

describe('archiving a site', () => {
  it('hides it from the list, keeps it under ?archived=1, refuses new shifts, and brings it back', async () => {
    const siteId = await addSite('Planning Archive Test', 62.454, -135.357, 'America/Whitehorse')
    const archived = await coordinator.post(`/api/sites/${siteId}/archive`, { archived: true })
    expect(archived.status).toBe(200)
    expect(archived.body.archivedAt).not.toBeNull()
    expect((await crew.get('/api/sites')).body.some((s: any) => s.id === siteId)).toBe(false)
    expect((await crew.get('/api/sites?archived=1')).body.some((s: any) => s.id === siteId)).toBe(true)
    const refused = await coordinator.post('/api/shifts', { siteId, title: 'Haul road', start: '2027-06-01T10:00', end: '2027-06-01T12:00', light: 'civil', assigneeIds: [] })
    expect(refused.status).toBe(400)
    expect(refused.body.message).toContain('siteId')
    const back = await coordinator.post(`/api/sites/${siteId}/archive`, { archived: false })
    expect(back.body.archivedAt).toBeNull()
    expect((await crew.get('/api/sites')).body.some((s: any) => s.id === siteId)).toBe(true)
  })

  it('refuses a body without archived (400 naming it)', async () => {
    const reply = await coordinator.post(`/api/sites/${ids.camp}/archive`, {})
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain('archived')
  })
})

describe('zone suggestion', () => {
  it('suggests the zone of the coordinates and says how far its clock is from the sun', async () => {
    const reply = await crew.get('/api/sites/zone-suggestion?lat=78.2232&lon=15.6267')
    expect(reply.status).toBe(200)
    expect(reply.body).toMatchObject({ timezone: 'Arctic/Longyearbyen', solarOffsetMinutes: 63, warning: null })
    expect(reply.body.candidates[0]).toBe('Arctic/Longyearbyen')
  })

  it('warns where clock noon is far from solar noon', async () => {
    // tz database (from memory): Yukon has kept UTC−07:00 all year since 2020; 135.357° W is
    // −541 min of solar time, so the clock runs 2 h 1 min ahead of the sun.
    const reply = await crew.get('/api/sites/zone-suggestion?lat=62.454&lon=-135.357')
    expect(reply.body).toMatchObject({ timezone: 'America/Whitehorse', zoneOffsetMinutes: -420, solarOffsetMinutes: -541, differenceMinutes: 121 })
    expect(reply.body.warning).toContain('14:01')
  })

  it('gives the warning for a zone the coordinator picked instead', async () => {
    const reply = await crew.get('/api/sites/zone-suggestion?lat=78.2232&lon=15.6267&tz=Asia/Tokyo')
    expect(reply.body.timezone).toBe('Asia/Tokyo')
    expect(reply.body.warning).toContain('ahead of the sun')
    expect(reply.body.candidates).toContain('Arctic/Longyearbyen')
  })

  it('answers 400 naming lat or tz for bad input', async () => {
    expect((await crew.get('/api/sites/zone-suggestion?lat=95&lon=0')).body.message).toContain('lat')
    const zone = await crew.get('/api/sites/zone-suggestion?lat=60&lon=0&tz=Mars/Olympus')
    expect(zone.status).toBe(400)
    expect(zone.body.message).toContain('tz')
  })
})
