import { describe, expect, it } from 'vitest'
import { formatZonedIso, localDateOf, localMidnightMs, resolveLocalOrInstant } from '../../server/core/time/zoned'
import { addDays } from '../../shared/format'

// Offsets and transition instants from the IANA tz database (Europe/Oslo: CET/CEST, EU rule,
// last Sunday of March 01:00 UTC and of October 01:00 UTC).
describe('local days and times in IANA zones', () => {
  it('finds local midnight in Oslo in winter (UTC+1) and summer (UTC+2)', () => {
    expect(new Date(localMidnightMs('2026-01-15', 'Europe/Oslo')).toISOString()).toBe('2026-01-14T23:00:00.000Z')
    expect(new Date(localMidnightMs('2026-07-15', 'Europe/Oslo')).toISOString()).toBe('2026-07-14T22:00:00.000Z')
  })

  it('gives the local date of an instant', () => {
    expect(localDateOf(Date.parse('2026-01-14T23:30:00Z'), 'Europe/Oslo')).toBe('2026-01-15')
    expect(localDateOf(Date.parse('2026-01-14T23:30:00Z'), 'America/Whitehorse')).toBe('2026-01-14')
  })

  it('formats with the zone offset', () => {
    expect(formatZonedIso(Date.parse('2026-06-21T10:00:00Z'), 'Antarctica/Troll')).toBe('2026-06-21T12:00:00+02:00')
    expect(formatZonedIso(Date.parse('2026-12-21T10:00:00Z'), 'Antarctica/McMurdo')).toBe('2026-12-21T23:00:00+13:00')
  })

  it('adds days across month and year ends', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01')
    expect(addDays('2028-03-01', -1)).toBe('2028-02-29')
  })

  it('reads a wall-clock time in the site zone and says which instant it chose in a gap or overlap', () => {
    expect(resolveLocalOrInstant('2026-01-15T08:00', 'Europe/Oslo')).toEqual({ ms: Date.parse('2026-01-15T07:00:00Z') })
    const gap = resolveLocalOrInstant('2026-03-29T02:30', 'Europe/Oslo')
    expect(gap.note).toMatch(/does not exist/)
    expect(new Date(gap.ms).toISOString()).toBe('2026-03-29T01:30:00.000Z')
    const overlap = resolveLocalOrInstant('2026-10-25T02:30', 'Europe/Oslo')
    expect(overlap.note).toMatch(/happens twice/)
    expect(new Date(overlap.ms).toISOString()).toBe('2026-10-25T00:30:00.000Z')
  })

  it('takes an instant with an offset as it is', () => {
    expect(resolveLocalOrInstant('2026-01-15T08:00:00+01:00', 'America/Nuuk').ms).toBe(Date.parse('2026-01-15T07:00:00Z'))
  })
})

describe('instants in query strings', () => {
  it('reads an offset whose plus sign arrived as a space', async () => {
    const { InstantSchema } = await import('../../server/utils/validation')
    expect(InstantSchema.parse('2026-12-01T08:00:00 01:00')).toBe('2026-12-01T08:00:00+01:00')
    expect(InstantSchema.safeParse('2026-12-01 08:00').success).toBe(false)
  })
})
