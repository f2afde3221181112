import { Body, Equator, Horizon, MakeTime, Observer } from 'astronomy-engine'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

// The light check of shifts created through the API, against astronomy-engine (npm, VSOP87 with
// precession, nutation and aberration; independent of suncalc and of the light engine). Thresholds are
// the USNO conventions of docs/light-model.md on the geometric altitude of the sun's centre: daylight needs h ≥ −0.833°,
// civil light h ≥ −6°. Shifts sit across civil dusk, on a polar-night day, over a daylight-saving change
// and across local midnight, at 69° N, 78° N and 78° S; minutes below must match within ±1.
const MINUTE_MS = 60_000
const STEP_MS = 2 * MINUTE_MS
const THRESHOLD = { daylight: -0.833, civil: -6 } as const

function referenceAltitude(ms: number, latitude: number, longitude: number) {
  const observer = new Observer(latitude, longitude, 0)
  const time = MakeTime(new Date(ms))
  const eq = Equator(Body.Sun, time, observer, true, true)
  // no refraction argument: Horizon gives the geometric altitude
  return Horizon(time, observer, eq.ra, eq.dec).altitude
}

// Where the altitude crosses the threshold between two samples, by bisection to under a second.
function bisectCrossing(f: (ms: number) => number, lo: number, hi: number) {
  let a = lo
  let b = hi
  const below = f(a) < 0
  while (b - a > 500) {
    const mid = (a + b) / 2
    if ((f(mid) < 0) === below) a = mid
    else b = mid
  }
  return (a + b) / 2
}

/** Minutes of [startMs, endMs) with the sun below the threshold, by astronomy-engine. */
function referenceMinutesBelow(latitude: number, longitude: number, startMs: number, endMs: number, threshold: number) {
  const f = (ms: number) => referenceAltitude(ms, latitude, longitude) - threshold
  let belowMs = 0
  for (let t = startMs; t < endMs; t += STEP_MS) {
    const next = Math.min(t + STEP_MS, endMs)
    const a = f(t) < 0
    const b = f(next) < 0
    if (a === b) {
      if (a) belowMs += next - t
      continue
    }
    const cross = bisectCrossing(f, t, next)
    belowMs += a ? cross - t : next - cross
  }
  return belowMs / MINUTE_MS
}

interface Case {
  what: string
  start: string
  end: string
  light: 'daylight' | 'civil'
  // whether the reference puts the shift partly or wholly below: guards that each case tests what it says
  expect: 'partly' | 'wholly'
}

const PLACES: { name: string, latitude: number, longitude: number, timezone: string, cases: Case[] }[] = [
  {
    name: 'Light Check 69N', latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo', cases: [
      { what: 'across civil dusk', start: '2027-02-20T14:00', end: '2027-02-20T19:00', light: 'civil', expect: 'partly' },
      { what: 'on a polar-night day', start: '2027-12-15T10:00', end: '2027-12-15T14:00', light: 'daylight', expect: 'wholly' },
      { what: 'over the spring daylight-saving change', start: '2027-03-28T00:30', end: '2027-03-28T08:00', light: 'daylight', expect: 'partly' },
      { what: 'across local midnight', start: '2027-08-20T21:00', end: '2027-08-21T03:00', light: 'civil', expect: 'partly' }
    ]
  },
  {
    name: 'Light Check 78N', latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen', cases: [
      { what: 'across civil dusk', start: '2027-02-26T12:00', end: '2027-02-26T18:00', light: 'civil', expect: 'partly' },
      { what: 'on a polar-night day', start: '2027-12-15T08:00', end: '2027-12-15T16:00', light: 'civil', expect: 'wholly' },
      { what: 'over the autumn daylight-saving change', start: '2027-10-31T00:00', end: '2027-10-31T06:00', light: 'civil', expect: 'wholly' },
      { what: 'across local midnight', start: '2027-04-15T21:00', end: '2027-04-16T03:00', light: 'daylight', expect: 'partly' }
    ]
  },
  {
    name: 'Light Check 78S', latitude: -77.846, longitude: 166.676, timezone: 'Antarctica/McMurdo', cases: [
      { what: 'across civil dusk', start: '2027-03-20T18:00', end: '2027-03-20T23:30', light: 'civil', expect: 'partly' },
      { what: 'on a polar-night day', start: '2027-06-21T10:00', end: '2027-06-21T16:00', light: 'daylight', expect: 'wholly' },
      { what: 'over the autumn daylight-saving change', start: '2027-04-04T00:00', end: '2027-04-04T09:00', light: 'civil', expect: 'partly' },
      { what: 'across local midnight', start: '2027-02-20T21:00', end: '2027-02-21T03:00', light: 'daylight', expect: 'partly' }
    ]
  }
]

let server: AppServer
let coordinator: ApiClient

beforeAll(async () => {
  server = await startAppServer()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

for (const place of PLACES) {
  describe(`light check through the API at ${place.name.slice(12)} (${place.timezone}) against astronomy-engine`, () => {
    let siteId: number
    beforeAll(async () => {
      const reply = await coordinator.post('/api/sites', { name: place.name, latitude: place.latitude, longitude: place.longitude, timezone: place.timezone })
      siteId = reply.body.id
    })

    for (const c of place.cases) {
      it(`matches minutes below ${c.light} within ±1 for a shift ${c.what}`, async () => {
        const reply = await coordinator.post('/api/shifts', { siteId, title: `Light check ${c.what}`, start: c.start, end: c.end, light: c.light, assigneeIds: [] })
        expect(reply.status).toBe(201)
        const startMs = Date.parse(reply.body.start)
        const endMs = Date.parse(reply.body.end)
        const reference = referenceMinutesBelow(place.latitude, place.longitude, startMs, endMs, THRESHOLD[c.light])
        const lengthMinutes = (endMs - startMs) / MINUTE_MS
        if (c.expect === 'wholly') expect(reference).toBeCloseTo(lengthMinutes, 5)
        else expect(reference > 1 && reference < lengthMinutes - 1, `reference ${reference.toFixed(1)} of ${lengthMinutes} min`).toBe(true)
        expect(Math.abs(reply.body.lightCheck.minutesBelow - reference)).toBeLessThanOrEqual(1)
        expect(reply.body.lightCheck.flagged).toBe(true)
        const listed = await coordinator.get(`/api/shifts/${reply.body.id}`)
        expect(listed.body.lightCheck).toEqual(reply.body.lightCheck)
      })
    }
  })
}
