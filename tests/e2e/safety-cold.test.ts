import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, signedInClient, startAppServer, type AppServer } from '../support/app-server'

let server: AppServer
let crew: ApiClient

beforeAll(async () => {
  server = await startAppServer()
  crew = await signedInClient(server, 'crew@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

async function cold(query: string) {
  return crew.get(`/api/cold?${query}`)
}

describe('GET /api/cold figures', () => {
  // NWS Wind Chill Chart (National Weather Service, 2001 index). The first two cells are NWS's own
  // worked examples (the second is also OSHA's); the others are chart cells read from memory of the
  // NWS chart, each consistent with the published 2001 formula.
  const NWS_CELLS: [number, number, number][] = [[0, 15, -19], [40, 35, 28], [30, 5, 25], [-10, 10, -28], [20, 20, 4], [-20, 15, -45]]
  for (const [t, v, expected] of NWS_CELLS) {
    it(`gives ${expected} °F for ${t} °F and ${v} mph (NWS chart)`, async () => {
      const reply = await cold(`temperature=${t}&wind=${v}&units=imperial`)
      expect(reply.status).toBe(200)
      expect(reply.body.windChill).toBe(expected)
    })
  }

  // Environment and Climate Change Canada wind chill table (same 2001 index, °C and km/h at 10 m);
  // cells from memory of the ECCC table, consistent with the metric formula.
  const ECCC_CELLS: [number, number, number][] = [[-10, 20, -18], [-20, 40, -34], [-30, 30, -46]]
  for (const [t, v, expected] of ECCC_CELLS) {
    it(`gives ${expected} for ${t} °C and ${v} km/h (ECCC table)`, async () => {
      expect((await cold(`temperature=${t}&wind=${v}&units=metric`)).body.windChill).toBe(expected)
    })
  }

  it('answers null wind chill where the index is not defined (above 10 °C, or wind at most 4.8 km/h)', async () => {
    expect((await cold('temperature=12&wind=30&units=metric')).body.windChill).toBeNull()
    expect((await cold('temperature=-20&wind=4&units=metric')).body.windChill).toBeNull()
  })

  it('bands frostbite as the ECCC table does: −46 falls in "skin can freeze in 5–10 minutes"', async () => {
    const body = (await cold('temperature=-30&wind=30&units=metric')).body
    expect(body.frostbite).toMatchObject({ minMinutes: 5, maxMinutes: 10 })
  })

  it('reads the ACGIH work/warm-up schedule, including the stop-work cells', async () => {
    // −30 °C with 10 km/h: row −29 to −31, wind read in the next column up (16 km/h) → 55 min / 3 breaks
    expect((await cold('temperature=-30&wind=10&units=metric')).body.warmup).toMatchObject({ maxWorkMinutes: 55, breaks: 3, stopWork: false })
    // −35 °C with 20 km/h: row −35 to −37, 24 km/h column → non-emergency work should cease
    expect((await cold('temperature=-35&wind=20&units=metric')).body.warmup).toMatchObject({ stopWork: true })
    // −20 °C: warmer than the table's first row → normal breaks (maxWorkMinutes null)
    expect((await cold('temperature=-20&wind=20&units=metric')).body.warmup).toMatchObject({ maxWorkMinutes: null, stopWork: false })
  })

  it('is open to every signed-in role and closed to the signed out', async () => {
    expect((await new ApiClient(server.url).get('/api/cold?temperature=0&wind=10')).status).toBe(401)
    const safety = await signedInClient(server, 'safety@gloamline.test')
    expect((await safety.get('/api/cold?temperature=0&wind=10')).status).toBe(200)
  })
})

describe('GET /api/cold bad input', () => {
  const CASES: [string, string][] = [
    ['temperature=-95&wind=10&units=metric', 'temperature'],
    ['temperature=61&wind=10&units=metric', 'temperature'],
    ['temperature=-150&wind=10&units=imperial', 'temperature'],
    ['temperature=cold&wind=10', 'temperature'],
    ['wind=10', 'temperature'],
    ['temperature=-10&wind=-1', 'wind'],
    ['temperature=-10&wind=5000', 'wind'],
    ['temperature=-10&wind=', 'wind'],
    ['temperature=-10&wind=10&units=kelvin', 'units']
  ]
  for (const [query, field] of CASES) {
    it(`answers 400 naming ${field} for ${query}`, async () => {
      const reply = await cold(query)
      expect(reply.status).toBe(400)
      expect(reply.body.data.issues[0].field).toBe(field)
      expect(reply.body.message).toContain(field)
    })
  }
})
