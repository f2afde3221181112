import { describe, expect, it } from 'vitest'
import { formatUtcOffset, toWallClock } from '../../shared/format'

// toWallClock reads each zone's offset once per UTC day and does the rest by arithmetic. Reference:
// Intl.DateTimeFormat, i.e. the IANA tz database bundled with Node, asked for every instant. The zones
// are chosen for their clock changes: EU summer time (Europe/Oslo), a half-hour change
// (Australia/Lord_Howe), a two-hour one (Antarctica/Troll), a skipped date (Pacific/Apia, 2011-12-30),
// a :45 offset (Pacific/Chatham) and a −03:30 one (America/St_Johns).
const ZONES = ['Europe/Oslo', 'Australia/Lord_Howe', 'Antarctica/Troll', 'Pacific/Apia', 'Pacific/Chatham', 'America/St_Johns', 'UTC']

const formatters = new Map<string, Intl.DateTimeFormat>()

function intlWallClock(ms: number, zone: string): string {
  const f = formatters.get(zone) ?? new Intl.DateTimeFormat('en-GB', { timeZone: zone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' })
  formatters.set(zone, f)
  const p = Object.fromEntries(f.formatToParts(ms).map(x => [x.type, x.value]))
  return `${p.year}-${p.month}-${p.day}T${p.hour}:${p.minute}:${p.second}`
}

describe('wall clock of an instant, with offsets cached per day', () => {
  it.each(ZONES)('agrees with Intl every 47 min 13.5 s through 2011–2012 in %s', (zone) => {
    let checked = 0
    const differ: string[] = []
    for (let ms = Date.UTC(2011, 0, 1); ms < Date.UTC(2013, 0, 1); ms += 47 * 60_000 + 13_500) {
      const want = intlWallClock(ms, zone)
      if (toWallClock(ms, zone) !== want) differ.push(`${new Date(ms).toISOString()}: ${toWallClock(ms, zone)} ≠ ${want}`)
      checked++
    }
    expect(checked).toBeGreaterThan(22_000)
    expect(differ).toEqual([])
  })

  it('reads the second either side of the EU spring change in Europe/Oslo (01:00 UTC, last Sunday of March, Directive 2000/84/EC)', () => {
    const change = Date.parse('2027-03-28T01:00:00Z')
    expect(toWallClock(change - 1000, 'Europe/Oslo')).toBe('2027-03-28T01:59:59')
    expect(toWallClock(change, 'Europe/Oslo')).toBe('2027-03-28T03:00:00')
    expect(formatUtcOffset(change - 1000, 'Europe/Oslo')).toBe('UTC+01:00')
    expect(formatUtcOffset(change, 'Europe/Oslo')).toBe('UTC+02:00')
  })
})
