import { describe, expect, it } from 'vitest'
import { ColdQuerySchema, computeColdFigures } from '../../server/core/cold/index'
import { COLD_CAUTIONS } from '../../shared/cold'

describe('computeColdFigures (GET /api/cold shape from docs/api.md)', () => {
  it('combines wind chill, frostbite band and warm-up schedule for a metric request', () => {
    // ECCC chart (memory): −30 °C with 30 km/h reads −46; ECCC band −40 to −47: 5–10 minutes.
    // ACGIH schedule: row −29 to −31, 32 km/h column → 30 minutes, 5 breaks.
    const figures = computeColdFigures({ temperature: -30, wind: 30, units: 'metric', sunUp: true })
    expect(figures.windChill).toBe(-46)
    expect(figures.frostbite).toMatchObject({ key: 'very-high', minMinutes: 5, maxMinutes: 10, basis: 'wind-chill' })
    expect(figures.warmup).toMatchObject({ maxWorkMinutes: 30, breaks: 5, stopWork: false })
  })

  it('answers an imperial request in °F and bands it on the °C index', () => {
    // NWS example quoted in docs/references.md: 0 °F, 15 mph → −19 °F (−28.6 °C: ECCC band −28 to −39).
    const figures = computeColdFigures({ temperature: 0, wind: 15, units: 'imperial' })
    expect(figures.windChill).toBe(-19)
    expect(figures.frostbite).toMatchObject({ key: 'high', wholeDegreeC: -29, minMinutes: 10, maxMinutes: 30 })
    // 0 °F = −17.8 °C: warmer than the schedule's first row.
    expect(figures.warmup).toMatchObject({ kind: 'outside-table', maxWorkMinutes: null, stopWork: false })
  })

  it('converts °F and mph for the schedule: −20 °F with 5 mph is the −29 to −31 °C row, 5 mph column', () => {
    // ACGIH schedule (°F side, memory): −20 to −24 °F with 5 mph → 75 minutes, 2 breaks.
    const figures = computeColdFigures({ temperature: -20, wind: 5, units: 'imperial', sunUp: true })
    expect(figures.temperatureC).toBeCloseTo(-28.889, 3)
    expect(figures.windKmh).toBeCloseTo(8.04672, 5)
    expect(figures.warmup).toMatchObject({ maxWorkMinutes: 75, breaks: 2 })
  })

  it('gives a null wind chill in calm air and bands the air temperature instead, saying so', () => {
    const figures = computeColdFigures({ temperature: -45, wind: 0, units: 'metric' })
    expect(figures.windChill).toBeNull()
    expect(figures.windChillReason).toBe('too-calm')
    expect(figures.frostbite).toMatchObject({ key: 'very-high', basis: 'air-temperature' })
    expect(figures.warmup.stopWork).toBe(true)
    expect(figures.cautions.map(c => c.key)).toContain('index-not-defined')
  })

  it('stops non-emergency work where the schedule says so', () => {
    expect(computeColdFigures({ temperature: -34, wind: 30, units: 'metric' }).warmup).toMatchObject({ stopWork: true, maxWorkMinutes: 0 })
  })

  it('applies the light-work rule when asked', () => {
    const moderate = computeColdFigures({ temperature: -30, wind: 0, units: 'metric', workload: 'moderate-heavy' })
    const light = computeColdFigures({ temperature: -30, wind: 0, units: 'metric', workload: 'light' })
    expect(moderate.warmup).toMatchObject({ maxWorkMinutes: null, breaks: 1 })
    expect(light.warmup).toMatchObject({ maxWorkMinutes: 75, breaks: 2 })
  })

  it('always leads its cautions with the planning-aid deference and adds the sunshine one in the dark', () => {
    const figures = computeColdFigures({ temperature: -30, wind: 40, units: 'metric', sunUp: false })
    const keys = figures.cautions.map(c => c.key)
    expect(keys[0]).toBe('planning-aid')
    expect(keys).toEqual(expect.arrayContaining(['sunshine-assumed', 'wind-beyond-table', 'wet-clothing', 'working-alone', 'hypothermia-signs', 'frostbite-signs']))
    expect(figures.cautions[0]!.text).toBe(COLD_CAUTIONS['planning-aid'])
    expect(COLD_CAUTIONS['planning-aid']).toMatch(/employer/)
  })
})

function issueFor(query: Record<string, unknown>) {
  const result = ColdQuerySchema.safeParse(query)
  expect(result.success).toBe(false)
  return result.error!.issues[0]!
}

describe('ColdQuerySchema', () => {
  it('coerces query strings and fills the defaults', () => {
    expect(ColdQuerySchema.parse({ temperature: '-28.5', wind: '20' })).toEqual({
      temperature: -28.5, wind: 20, units: 'metric', workload: 'moderate-heavy'
    })
    expect(ColdQuerySchema.parse({ temperature: '-10', wind: '5', units: 'imperial', sunUp: 'false' }).sunUp).toBe(false)
  })

  it.each([
    [{ temperature: '-91', wind: '10' }, 'temperature'],
    [{ temperature: '61', wind: '10' }, 'temperature'],
    [{ temperature: '-131', wind: '10', units: 'imperial' }, 'temperature'],
    [{ temperature: '141', wind: '10', units: 'imperial' }, 'temperature'],
    [{ temperature: '-10', wind: '-1' }, 'wind'],
    [{ temperature: '-10', wind: 'abc' }, 'wind'],
    [{ temperature: '-10', wind: '' }, 'wind'],
    [{ temperature: '', wind: '10' }, 'temperature'],
    [{ wind: '10' }, 'temperature'],
    [{ temperature: 'Infinity', wind: '10' }, 'temperature'],
    [{ temperature: 'NaN', wind: '10' }, 'temperature'],
    [{ temperature: '-10', wind: '401' }, 'wind'],
    [{ temperature: '-10', wind: '251', units: 'imperial' }, 'wind'],
    [{ temperature: '-10', wind: '10', units: 'kelvin' }, 'units'],
    [{ temperature: '-10', wind: '10', workload: 'heavy' }, 'workload'],
    [{ temperature: '-10', wind: '10', sunUp: 'maybe' }, 'sunUp']
  ])('rejects %o with an error on %s that names it', (query, field) => {
    const issue = issueFor(query)
    expect(issue.path).toEqual([field])
    expect(issue.message).toContain(field)
  })

  it('accepts the limits themselves', () => {
    expect(ColdQuerySchema.safeParse({ temperature: '-90', wind: '400' }).success).toBe(true)
    expect(ColdQuerySchema.safeParse({ temperature: '60', wind: '0' }).success).toBe(true)
    expect(ColdQuerySchema.safeParse({ temperature: '-130', wind: '250', units: 'imperial' }).success).toBe(true)
    expect(ColdQuerySchema.safeParse({ temperature: '140', wind: '0', units: 'imperial' }).success).toBe(true)
  })

  it('checks the range in the request\'s units: 100 °F passes, 100 °C does not', () => {
    expect(ColdQuerySchema.safeParse({ temperature: '100', wind: '10', units: 'imperial' }).success).toBe(true)
    expect(ColdQuerySchema.safeParse({ temperature: '100', wind: '10', units: 'metric' }).success).toBe(false)
  })
})
