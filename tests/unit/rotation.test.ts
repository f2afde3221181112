// A rotation's cycle expanded into shifts on the site's wall clock. Reference for the clock: the tz
// data as the runtime's Intl.DateTimeFormat applies it (read back independently of the code under
// test). Europe/Oslo and Arctic/Longyearbyen follow EU summer time (Directive 2000/84/EC): clocks go
// forward 02:00 → 03:00 on the last Sunday of March (28 March 2027) and back 03:00 → 02:00 on the
// last Sunday of October (31 October 2027), both at 01:00 UTC. The New Zealand dates below are
// from memory (first Sunday of April, last Sunday of September); every check reads the zone through Intl.
import { describe, expect, it } from 'vitest'
import { countRotationDays, expandRotation, findRotationIssues, isRotationWorkingDay, rankRotationDays, resolveRotationTime, type RotationCycle } from '../../server/core/planning/rotation'

const SVALBARD = 'Arctic/Longyearbyen'
const HOUR_MS = 3_600_000

// The wall clock of an instant as Intl reads it from the tz data: `YYYY-MM-DD HH:mm` and the offset.
function intlWall(ms: number, timeZone: string) {
  const parts = Object.fromEntries(new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'longOffset'
  }).formatToParts(ms).map(p => [p.type, p.value]))
  return { wall: `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`, offset: parts.timeZoneName }
}

function cycle(over: Partial<RotationCycle>): RotationCycle {
  return { from: '2027-03-20', to: '2027-04-05', startTime: '08:00', endTime: '16:00', onDays: 1, offDays: 0, ...over }
}

function dateAfter(date: string) {
  return new Date(Date.parse(`${date}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10)
}

describe('rotation expansion on the site\'s wall clock (tz data via Intl)', () => {
  for (const [name, from, to] of [['spring', '2027-03-20', '2027-04-05'], ['autumn', '2027-10-20', '2027-11-10']] as const) {
    it(`keeps a daily 08:00–16:00 shift at 08:00 and 16:00 local through the ${name} clock change`, () => {
      const planned = expandRotation(cycle({ from, to }), SVALBARD)
      expect(planned).toHaveLength(countRotationDays(from, to))
      for (const p of planned) {
        expect(intlWall(p.startMs, SVALBARD).wall).toBe(`${p.date} 08:00`)
        expect(intlWall(p.endMs, SVALBARD).wall).toBe(`${p.date} 16:00`)
        expect(p.endMs - p.startMs).toBe(8 * HOUR_MS)
        expect(p.timeNotes).toEqual([])
      }
      // the offset really changes inside the range (summer time +02:00, standard time +01:00)
      expect(new Set(planned.map(p => intlWall(p.startMs, SVALBARD).offset))).toEqual(new Set(['GMT+01:00', 'GMT+02:00']))
    })

    it(`keeps a 22:00–06:00 night shift on the wall clock through the ${name} change, an hour ${name === 'spring' ? 'shorter' : 'longer'} that night`, () => {
      const planned = expandRotation(cycle({ from, to, startTime: '22:00', endTime: '06:00' }), SVALBARD)
      const changeNight = name === 'spring' ? '2027-03-27' : '2027-10-30'
      for (const p of planned) {
        expect(intlWall(p.startMs, SVALBARD).wall).toBe(`${p.date} 22:00`)
        expect(intlWall(p.endMs, SVALBARD).wall).toBe(`${dateAfter(p.date)} 06:00`)
        const expectedHours = p.date === changeNight ? (name === 'spring' ? 7 : 9) : 8
        expect((p.endMs - p.startMs) / HOUR_MS).toBe(expectedHours)
      }
    })
  }

  it('moves a start in the skipped hour to the first minute after the gap, and says so', () => {
    const planned = expandRotation(cycle({ from: '2027-03-27', to: '2027-03-29', startTime: '02:30', endTime: '10:00' }), SVALBARD)
    const [before, gapDay, after] = planned
    expect(intlWall(before!.startMs, SVALBARD).wall).toBe('2027-03-27 02:30')
    expect(intlWall(gapDay!.startMs, SVALBARD)).toEqual({ wall: '2027-03-28 03:00', offset: 'GMT+02:00' })
    expect(gapDay!.startMs).toBe(Date.parse('2027-03-28T01:00:00Z'))
    expect(gapDay!.timeNotes.join(' ')).toMatch(/does not exist.*03:00/)
    expect(intlWall(after!.startMs, SVALBARD).wall).toBe('2027-03-29 02:30')
  })

  it('takes the first occurrence of a time in the repeated hour, and says so', () => {
    const { ms, note } = resolveRotationTime('2027-10-31', '02:30', SVALBARD)
    // 02:30 happens at 00:30 UTC (+02:00) and again at 01:30 UTC (+01:00)
    expect(ms).toBe(Date.parse('2027-10-31T00:30:00Z'))
    expect(intlWall(ms, SVALBARD)).toEqual({ wall: '2027-10-31 02:30', offset: 'GMT+02:00' })
    expect(note).toMatch(/happens twice/)
  })

  it('handles a southern zone\'s changes the same way (Pacific/Auckland: forward 26 Sep 2027 02:00→03:00, back 4 Apr 2027 03:00→02:00)', () => {
    const gap = resolveRotationTime('2027-09-26', '02:15', 'Pacific/Auckland')
    expect(intlWall(gap.ms, 'Pacific/Auckland')).toEqual({ wall: '2027-09-26 03:00', offset: 'GMT+13:00' })
    const twice = resolveRotationTime('2027-04-04', '02:15', 'Pacific/Auckland')
    expect(intlWall(twice.ms, 'Pacific/Auckland')).toEqual({ wall: '2027-04-04 02:15', offset: 'GMT+13:00' })
  })

  it('works 4 days then rests 3, starting on from', () => {
    const c = cycle({ from: '2027-10-18', to: '2027-11-07', onDays: 4, offDays: 3 })
    const dates = expandRotation(c, SVALBARD).map(p => p.date)
    expect(dates).toEqual([
      '2027-10-18', '2027-10-19', '2027-10-20', '2027-10-21',
      '2027-10-25', '2027-10-26', '2027-10-27', '2027-10-28',
      '2027-11-01', '2027-11-02', '2027-11-03', '2027-11-04'
    ])
    expect(isRotationWorkingDay(c, '2027-10-22')).toBe(false)
    expect(isRotationWorkingDay(c, '2027-10-25')).toBe(true)
  })

  it('makes 366 daily shifts over a leap year\'s 366 days', () => {
    expect(expandRotation(cycle({ from: '2028-01-01', to: '2028-12-31' }), SVALBARD)).toHaveLength(366)
  })
})

describe('rotation input problems, each naming its field', () => {
  const cases: [string, Partial<RotationCycle>, string][] = [
    ['0 working days', { onDays: 0 }, 'onDays'],
    ['negative off days', { offDays: -1 }, 'offDays'],
    ['to before from', { from: '2027-04-05', to: '2027-04-04' }, 'to'],
    ['more than 366 days', { from: '2027-01-01', to: '2028-01-02' }, 'to'],
    ['an hour that does not exist', { startTime: '24:00' }, 'startTime'],
    ['minutes past 59', { endTime: '16:60' }, 'endTime'],
    ['a date that does not exist', { from: '2027-02-30' }, 'from']
  ]
  for (const [name, over, field] of cases) {
    it(`refuses ${name}`, () => {
      expect(findRotationIssues(cycle(over)).map(i => i.field)).toContain(field)
    })
  }

  it('accepts exactly 366 days and an end at the start time (a 24-hour shift)', () => {
    expect(findRotationIssues(cycle({ from: '2027-01-01', to: '2028-01-01', endTime: '08:00' }))).toEqual([])
  })
})

describe('ranking a rotation\'s days', () => {
  it('puts the most minutes short first, then the most conflicts, then the earliest', () => {
    const ranked = rankRotationDays([
      { date: '2027-11-01', minutesBelow: 30, conflicts: 0 },
      { date: '2027-11-02', minutesBelow: 90, conflicts: 0 },
      { date: '2027-11-03', minutesBelow: 30, conflicts: 2 },
      { date: '2027-10-31', minutesBelow: 30, conflicts: 0 }
    ])
    expect(ranked.map(d => d.date)).toEqual(['2027-11-02', '2027-11-03', '2027-10-31', '2027-11-01'])
  })
})
