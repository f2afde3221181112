import { describe, expect, it } from 'vitest'
import { getPosition } from 'suncalc'
import { computeLightDaysMs } from '../../server/core/light/index'
import { SUNCALC_HORIZON_REFRACTION_DEG } from '../../server/core/sun/position'

// The engine finds crossings on the sun's daily course (δ and α interpolated between daily samples of
// suncalc's position). Reference: suncalc 2.0.2's getPosition itself, whose apparent altitude below
// the horizon is the geometric altitude + its constant refraction (node_modules/suncalc/index.js,
// astroRefraction clamps at 0): each reported crossing must be where that altitude passes the
// threshold, i.e. on opposite sides of it 1 s before and 1 s after the reported second (± the 0.5 s
// rounding to whole seconds). Thresholds: docs/light-model.md, −0.833°, −6°, −12°, −18° (USNO).
const THRESHOLD: Record<string, number> = {
  'sunrise': -0.833, 'sunset': -0.833, 'civil-dawn': -6, 'civil-dusk': -6,
  'nautical-dawn': -12, 'nautical-dusk': -12, 'astronomical-dawn': -18, 'astronomical-dusk': -18
}
// `least`: a floor on the crossings of the year, so the check cannot pass on too few. At 0° every
// threshold is crossed twice a day (8 × 365 = 2,920); near the poles each is crossed a few times a
// year only, as the declination passes it (89.95° takes the engine's sampled search, not the course).
const SITES = [
  { latitude: 0, longitude: 0, timezone: 'UTC', least: 2900 },
  { latitude: 60, longitude: 10.75, timezone: 'Europe/Oslo', least: 1000 },
  { latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen', least: 200 },
  { latitude: -89.5, longitude: 0, timezone: 'Antarctica/McMurdo', least: 4 },
  { latitude: 89.95, longitude: 0, timezone: 'UTC', least: 4 }
]

function apparent(ms: number, latitude: number, longitude: number) {
  return getPosition(new Date(ms), latitude, longitude).altitude
}

describe('crossings found on the daily course are crossings of suncalc\'s own position', () => {
  it.each(SITES)('every crossing of 2027 at $latitude° brackets its threshold within ±1.5 s', (site) => {
    const days = computeLightDaysMs({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from: '2027-01-01', to: '2027-12-31' })
    let checked = 0
    const wrong: string[] = []
    for (const day of days) {
      for (const event of day.events) {
        const level = THRESHOLD[event.type]
        if (level === undefined) continue
        const target = level + SUNCALC_HORIZON_REFRACTION_DEG
        const before = apparent(event.atMs - 1500, site.latitude, site.longitude) - target
        const after = apparent(event.atMs + 1500, site.latitude, site.longitude) - target
        const rising = !/set|dusk/.test(event.type)
        if (!(rising ? before < 0 && after > 0 : before > 0 && after < 0)) wrong.push(`${day.date} ${event.type} ${new Date(event.atMs).toISOString()}`)
        checked++
      }
    }
    expect(wrong).toEqual([])
    expect(checked).toBeGreaterThanOrEqual(site.least)
  })
})
