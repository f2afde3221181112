// Small rules found on the way: one site per name, and one rule for whether a review decision is
// current (the shift and its history agree, through a title edit and after a change of time).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { TEST_CLOCK } from '../support/clock'
import { createDarkShift, createDarkSite, findPeopleIds, startSafetyWorld, type SafetyWorld } from '../support/safety-fixtures'

let world: SafetyWorld
beforeAll(async () => {
  world = await startSafetyWorld({ REQUEST_LOG: 'off' }, TEST_CLOCK.weekdayMorning)
})
afterAll(async () => {
  await world?.stop()
})

describe('site names', () => {
  it('refuses a second site with a name already in use, in any case, with 409 naming name; nothing is added', async () => {
    const first = await world.coordinator.post('/api/sites', { name: 'Invented Fjord Camp', latitude: 70.1, longitude: 21.2, timezone: 'Europe/Oslo' })
    expect(first.status).toBe(201)
    const count = (await world.coordinator.get('/api/sites')).body.length
    for (const name of ['Invented Fjord Camp', 'invented fjord camp', 'INVENTED FJORD CAMP']) {
      const again = await world.coordinator.post('/api/sites', { name, latitude: 69, longitude: 19, timezone: 'Europe/Oslo' })
      expect(again.status, name).toBe(409)
      expect(again.body.data.issues[0].field).toBe('name')
    }
    expect((await world.coordinator.get('/api/sites')).body.length).toBe(count)
    // and a rename onto it is refused the same way
    const other = await world.coordinator.post('/api/sites', { name: 'Invented Moraine Camp', latitude: 70.2, longitude: 21.3, timezone: 'Europe/Oslo' })
    const renamed = await world.coordinator.patch(`/api/sites/${other.body.id}`, { name: 'Invented Fjord Camp' })
    expect(renamed.status).toBe(409)
  })
})

describe('whether a review decision is current', () => {
  it('is the same on the shift and in its history: still current after a title edit, no longer after a change of time', async () => {
    const site = await createDarkSite(world.coordinator, 'Invented Review Rule Site')
    const { crew } = await findPeopleIds(world.coordinator)
    const shift = await createDarkShift(world.coordinator, site.id, { daysAhead: 3, assigneeIds: crew.slice(0, 2) })
    expect(shift.reviewState).toBe('pending')
    const decided = await world.safety.post(`/api/shifts/${shift.id}/review`, { decision: 'approved', mitigations: ['portable-lighting', 'two-person-minimum'], note: 'Lit and paired.', version: shift.version })
    expect(decided.status, JSON.stringify(decided.body)).toBe(201)
    const read = async () => {
      const onShift = (await world.coordinator.get(`/api/shifts/${shift.id}`)).body
      const history = (await world.coordinator.get(`/api/shifts/${shift.id}/reviews`)).body
      return { onShift: onShift.review.current as boolean, inHistory: history[0].current as boolean, version: onShift.version as number, state: onShift.reviewState as string }
    }
    const afterDecision = await read()
    expect(afterDecision).toMatchObject({ onShift: true, inHistory: true, state: 'approved' })

    const titled = await world.coordinator.patch(`/api/shifts/${shift.id}`, { title: 'Invented night task, renamed', version: afterDecision.version })
    expect(titled.status).toBe(200)
    const afterTitle = await read()
    expect(afterTitle).toMatchObject({ onShift: true, inHistory: true, state: 'approved' })

    const moved = await world.coordinator.patch(`/api/shifts/${shift.id}`, { start: titled.body.start.replace('T23:00', 'T22:30'), version: afterTitle.version })
    expect(moved.status, JSON.stringify(moved.body)).toBe(200)
    const afterMove = await read()
    expect(afterMove).toMatchObject({ onShift: false, inHistory: false, state: 'pending' })
  })
})
