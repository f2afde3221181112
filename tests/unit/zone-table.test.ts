import { describe, expect, it } from 'vitest'
import { localDateOf, localMidnightMs, resolveWallClock, wallClockOf, zoneOffsetMinutes } from '../../server/core/time/zone-table'
import { resolveLocalOrInstant } from '../../server/core/time/zoned'
import { resolveWallTimeOnce } from '../../server/core/time/instant-format'
import { fromWallClock } from '../../shared/format'

// Reference: the IANA tz database as bundled with Node, read through Intl.DateTimeFormat one instant
// at a time (no caching, no tables): the wall clock an instant shows is a fact of the tz data; which
// instant a wall clock names in a gap or an overlap is our rule (docs/light-model.md, "Local time").

const HOUR = 3_600_000
const DAY = 86_400_000
const FORMATTERS = new Map<string, Intl.DateTimeFormat>()

function intlWall(ms: number, zone: string): string {
  let f = FORMATTERS.get(zone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone: zone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' })
    FORMATTERS.set(zone, f)
  }
  const p = Object.fromEntries(f.formatToParts(new Date(ms)).map(x => [x.type, x.value]))
  return `${p.year}-${p.month}-${p.day}T${p.hour}:${p.minute}:${p.second}`
}

function intlOffset(ms: number, zone: string): number {
  return Date.parse(`${intlWall(ms, zone)}Z`) - Math.floor(ms / 1000) * 1000
}

function isoWall(wallMs: number): string {
  return new Date(wallMs).toISOString().slice(0, 19)
}

/** Offset changes of a zone in [fromMs, toMs), found by an hourly Intl scan, each refined to the minute. */
function intlChanges(zone: string, fromMs: number, toMs: number) {
  const changes: { atMs: number, before: number, after: number }[] = []
  let prev = intlOffset(fromMs, zone)
  for (let t = fromMs + HOUR; t < toMs; t += HOUR) {
    const o = intlOffset(t, zone)
    if (o === prev) continue
    let lo = t - HOUR
    let hi = t
    while (hi - lo > 60_000) {
      const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000
      if (intlOffset(mid, zone) === prev) lo = mid
      else hi = mid
    }
    changes.push({ atMs: hi, before: prev, after: o })
    prev = o
  }
  return changes
}

/** What the rule says a wall time names, worked out from Intl alone. */
function referenceReading(wallMs: number, zone: string) {
  const offsets = new Set<number>()
  for (let t = wallMs - 2 * DAY; t <= wallMs + 2 * DAY; t += HOUR) offsets.add(intlOffset(t, zone))
  const wall = isoWall(wallMs)
  const matches = [...offsets].map(o => wallMs - o).filter(ms => intlWall(ms, zone) === wall).sort((a, b) => a - b)
  if (matches.length) return { kind: matches.length > 1 ? 'overlap' : 'once', ms: matches[0]! }
  // In a gap: read with the offset in force before the change, which the earliest candidate instant still sees.
  const before = intlOffset(wallMs - Math.max(...offsets), zone)
  return { kind: 'gap', ms: wallMs - before }
}

// Zones chosen for their clock changes (tz data): Oslo 1 h at 01:00 UTC (EU rule); Troll 2 h
// (+00 ↔ +02, on the EU dates); Lord Howe 30 min (+10:30 ↔ +11); Havana and Santiago change at local
// midnight; St John's and Chatham have offsets that are not whole hours.
const ZONES = ['Europe/Oslo', 'Antarctica/Troll', 'Australia/Lord_Howe', 'America/Havana', 'America/Santiago', 'America/St_Johns', 'Pacific/Chatham']

describe('the one rule for wall-clock times, against the tz data through Intl', () => {
  it('reads every wall time within an hour of each 2027 clock change as the rule says', () => {
    const problems: string[] = []
    let gaps = 0
    let overlaps = 0
    for (const zone of ZONES) {
      for (const change of intlChanges(zone, Date.UTC(2027, 0, 1), Date.UTC(2028, 0, 1))) {
        const first = change.atMs + Math.min(change.before, change.after) - HOUR
        const last = change.atMs + Math.max(change.before, change.after) + HOUR
        for (let wallMs = first; wallMs <= last; wallMs += 10 * 60_000) {
          const expected = referenceReading(wallMs, zone)
          const found = resolveWallClock(isoWall(wallMs), zone)
          if (found.kind !== expected.kind || found.ms !== expected.ms) problems.push(`${zone} ${isoWall(wallMs)}: ${found.kind} ${found.ms} ≠ ${expected.kind} ${expected.ms}`)
          if (expected.kind === 'gap') {
            gaps++
            // forward by the gap: the instant shows the wall time plus the length of the gap
            if (intlWall(found.ms, zone) !== isoWall(wallMs + change.after - change.before)) problems.push(`${zone} ${isoWall(wallMs)} not moved by the gap`)
          }
          if (expected.kind === 'overlap') overlaps++
        }
      }
    }
    expect(problems).toEqual([])
    // every zone above changes its clocks twice in 2027, so both cases were met
    expect(gaps).toBeGreaterThan(20)
    expect(overlaps).toBeGreaterThan(20)
  })

  it('gives the instant Intl shows for ordinary times all year, and the same wall clock back', () => {
    const problems: string[] = []
    for (const zone of ZONES) {
      for (let t = Date.UTC(2027, 0, 1, 0, 7); t < Date.UTC(2028, 0, 1); t += 97 * 60_000 + 13_000) {
        if (wallClockOf(t, zone) !== intlWall(t, zone)) problems.push(`${zone} ${t} wall ${wallClockOf(t, zone)} ≠ ${intlWall(t, zone)}`)
        if (localDateOf(t, zone) !== intlWall(t, zone).slice(0, 10)) problems.push(`${zone} ${t} date`)
        if (zoneOffsetMinutes(t, zone) * 60_000 !== intlOffset(t, zone)) problems.push(`${zone} ${t} offset`)
      }
    }
    expect(problems).toEqual([])
  })

  it('takes the earlier instant and says so for overlaps of 2 h (Troll), 30 min (Lord Howe) and 1 h (Oslo)', () => {
    // Troll goes from +02 back to +00 at 01:00 UTC on 31 October 2027: 01:00–03:00 happens twice
    const troll = resolveLocalOrInstant('2027-10-31T02:00', 'Antarctica/Troll')
    expect(new Date(troll.ms).toISOString()).toBe('2027-10-31T00:00:00.000Z')
    expect(troll.note).toMatch(/happens twice in Antarctica\/Troll \(clocks go back 2 h\); the first, 2027-10-31T02:00:00\+02:00/)
    // Lord Howe goes from +11 back to +10:30 at 02:00 local on 4 April 2027: 01:30–02:00 happens twice
    const howe = resolveLocalOrInstant('2027-04-04T01:45', 'Australia/Lord_Howe')
    expect(new Date(howe.ms).toISOString()).toBe('2027-04-03T14:45:00.000Z')
    expect(howe.note).toMatch(/happens twice .*clocks go back 30 min.*2027-04-04T01:45:00\+11:00/)
    const oslo = resolveLocalOrInstant('2027-10-31T02:30', 'Europe/Oslo')
    expect(new Date(oslo.ms).toISOString()).toBe('2027-10-31T00:30:00.000Z')
    expect(oslo.note).toMatch(/clocks go back 1 h/)
    for (const [wall, zone] of [['2027-10-31T02:00:00', 'Antarctica/Troll'], ['2027-04-04T01:45:00', 'Australia/Lord_Howe'], ['2027-10-31T02:30:00', 'Europe/Oslo']] as const) {
      expect(resolveWallTimeOnce(wall, zone)).toBeNull()
    }
  })

  it('moves a time in a gap forward by the gap, with a note: 2 h (Troll), 30 min (Lord Howe), 1 h (Oslo)', () => {
    // Troll goes from +00 to +02 at 01:00 UTC on 28 March 2027: 01:00–03:00 does not exist
    const troll = resolveLocalOrInstant('2027-03-28T01:30', 'Antarctica/Troll')
    expect(intlWall(troll.ms, 'Antarctica/Troll')).toBe('2027-03-28T03:30:00')
    expect(troll.note).toMatch(/does not exist .*clocks go forward 2 h.*03:30 was used/)
    // Lord Howe goes from +10:30 to +11 at 02:00 local on 3 October 2027: 02:00–02:30 does not exist
    const howe = resolveLocalOrInstant('2027-10-03T02:10', 'Australia/Lord_Howe')
    expect(intlWall(howe.ms, 'Australia/Lord_Howe')).toBe('2027-10-03T02:40:00')
    expect(howe.note).toMatch(/clocks go forward 30 min/)
    const oslo = resolveLocalOrInstant('2027-03-28T02:30', 'Europe/Oslo')
    expect(new Date(oslo.ms).toISOString()).toBe('2027-03-28T01:30:00.000Z')
  })

  it('reads a wall time in the browser (shared/format.ts) to the same instant as on the server', () => {
    const problems: string[] = []
    for (const zone of ZONES) {
      for (const change of intlChanges(zone, Date.UTC(2027, 0, 1), Date.UTC(2028, 0, 1))) {
        for (let wallMs = change.atMs + Math.min(change.before, change.after) - HOUR; wallMs <= change.atMs + Math.max(change.before, change.after) + HOUR; wallMs += 10 * 60_000) {
          const wall = isoWall(wallMs)
          if (fromWallClock(wall, zone) !== resolveWallClock(wall, zone).ms) problems.push(`${zone} ${wall}`)
        }
      }
    }
    expect(problems).toEqual([])
  })

  it('starts a local day at the first instant that shows its date, also when midnight is skipped', () => {
    for (const zone of ZONES) {
      for (const change of intlChanges(zone, Date.UTC(2027, 0, 1), Date.UTC(2028, 0, 1))) {
        for (const dayMs of [change.atMs - DAY, change.atMs, change.atMs + DAY]) {
          const date = intlWall(dayMs, zone).slice(0, 10)
          const start = localMidnightMs(date, zone)
          expect(intlWall(start, zone).slice(0, 10)).toBe(date)
          expect(intlWall(start - 1000, zone).slice(0, 10) < date).toBe(true)
        }
      }
    }
    // Havana moves from 00:00 to 01:00 on 14 March 2027 (second Sunday of March; from memory, as the tz data has it)
    expect(intlWall(localMidnightMs('2027-03-14', 'America/Havana'), 'America/Havana')).toBe('2027-03-14T01:00:00')
  })

  it('refuses a wall time that is not one', () => {
    expect(() => resolveWallClock('2027-02-30T08:00', 'Europe/Oslo')).toThrow(RangeError)
    expect(() => resolveWallClock('2027-02-03 08:00', 'Europe/Oslo')).toThrow(RangeError)
    expect(() => resolveWallClock('2027-02-03T08:00', 'Mars/Olympus')).toThrow(/IANA/)
    expect(Number.isNaN(resolveLocalOrInstant('2027-02-30T08:00', 'Europe/Oslo').ms)).toBe(true)
  })
})
