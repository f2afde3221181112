// The moon in the light routes (docs/api.md, "Light"), over HTTP from the built server, against
// astronomy-engine's topocentric moon (Equator(Body.Moon, date, observer, true, true), Horizon without
// refraction): every day carries `moon`, each rise and set is within 0.05° of −0.833°, the up spans
// stay inside their local day, and the lit fraction is within 0.001 of Illumination().phase_fraction.
import { Body, Equator, Horizon, Illumination, Observer } from 'astronomy-engine'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'

let server: AppServer
let crew: ApiClient

beforeAll(async () => {
  server = await startAppServer()
  crew = await signedInClient(server, 'crew@gloamline.test')
}, 60_000)
afterAll(async () => {
  await server?.stop()
})

function referenceAltitude(ms: number, latitude: number, longitude: number): number {
  const observer = new Observer(latitude, longitude, 0)
  const eq = Equator(Body.Moon, new Date(ms), observer, true, true)
  return Horizon(new Date(ms), observer, eq.ra, eq.dec).altitude
}

describe('the moon in /api/light and /api/sites/:id/light', () => {
  it('adds rise, set, up spans and lit fraction to each day of a polar-night fortnight at 78.2°N', async () => {
    const reply = await crew.get('/api/light?lat=78.22&lon=15.63&tz=Europe/Oslo&from=2026-12-10&to=2026-12-24')
    expect(reply.status).toBe(200)
    expect(reply.body.days).toHaveLength(15)
    let events = 0
    for (const day of reply.body.days) {
      expect(Object.keys(day.moon).sort()).toEqual(['events', 'illumination', 'maxAltitude', 'up'])
      for (const span of day.moon.up) {
        expect(span.start.slice(0, 10)).toBe(day.date)
        expect(Date.parse(span.end)).toBeGreaterThan(Date.parse(span.start))
      }
      for (const e of day.moon.events) {
        events++
        expect(['moonrise', 'moonset']).toContain(e.type)
        expect(Math.abs(referenceAltitude(Date.parse(e.at), 78.22, 15.63) + 0.833)).toBeLessThan(0.05)
      }
      const noon = Date.parse(`${day.date}T12:00:00+01:00`)
      expect(Math.abs(day.moon.illumination - Illumination(Body.Moon, new Date(noon)).phase_fraction)).toBeLessThan(0.001)
    }
    expect(events).toBeGreaterThan(4)
  })

  it('gives a site\'s days the same moon as the coordinates do', async () => {
    const site = (await crew.get('/api/sites')).body[0]
    const bySite = await crew.get(`/api/sites/${site.id}/light?from=2026-12-14&to=2026-12-15`)
    const byPlace = await crew.get(`/api/light?lat=${site.latitude}&lon=${site.longitude}&tz=${encodeURIComponent(site.timezone)}&from=2026-12-14&to=2026-12-15`)
    expect(bySite.status).toBe(200)
    expect(bySite.body.days.map((d: any) => d.moon)).toEqual(byPlace.body.days.map((d: any) => d.moon))
  })
})
