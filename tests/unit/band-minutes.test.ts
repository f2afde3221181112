// Minutes per light band over a shift (server/core/review/queue.ts sumBandMinutes): the rounded bands
// add up to the shift's length rounded once, by the largest-remainder rule (common practice for
// rounding parts of a whole; as in apportionment, "Hamilton's method").
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { sumBandMinutes } from '../../server/core/review/queue'
import { BAND_KINDS, type BandKind } from '../../shared/light'

const T10 = Date.parse('2027-01-12T10:00:00Z')
const MIN = 60_000

describe('minutes per light band', () => {
  it('a 10:00–14:00 shift in three bands of 80.5, 80.5 and 79 min gives 240 min in all, not 241', () => {
    const a = T10 + 80.5 * MIN
    const b = a + 80.5 * MIN
    const sums = sumBandMinutes([
      { kind: 'civil', startMs: T10, endMs: a },
      { kind: 'nautical', startMs: a, endMs: b },
      { kind: 'night', startMs: b, endMs: T10 + 240 * MIN }
    ])
    expect(sums.civil + sums.nautical + sums.night).toBe(240)
    // the darker part, as the crew home words it: nautical + astronomical + night
    expect(sums.nautical + sums.astronomical + sums.night).toBeLessThanOrEqual(240)
    expect(sums.day).toBe(0)
  })

  it('for any split of any shift, the bands add up to the whole rounded once, each within a minute of its exact length', () => {
    fc.assert(fc.property(fc.array(fc.tuple(fc.constantFrom<BandKind>(...BAND_KINDS), fc.integer({ min: 1, max: 600_000 })), { minLength: 1, maxLength: 8 }), (pieces) => {
      let at = T10
      const bands = pieces.map(([kind, seconds]) => {
        const band = { kind, startMs: at, endMs: at + seconds * 100 }
        at = band.endMs
        return band
      })
      const sums = sumBandMinutes(bands)
      const total = BAND_KINDS.reduce((n, k) => n + sums[k], 0)
      expect(total).toBe(Math.round((at - T10) / MIN))
      for (const k of BAND_KINDS) {
        const exact = bands.filter(b => b.kind === k).reduce((n, b) => n + (b.endMs - b.startMs) / MIN, 0)
        expect(Math.abs(sums[k] - exact)).toBeLessThan(1)
      }
    }), { numRuns: 500 })
  })
})
