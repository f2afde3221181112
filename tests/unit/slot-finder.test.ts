import { describe, expect, it } from 'vitest'
import { computeLightDaysMs } from '../../server/core/light/index'
import { findShiftConflicts, type ConflictContext, type NeighbourShift } from '../../server/core/planning/conflicts'
import { findSlots, listValidSlotStarts, type SlotSearchInput } from '../../server/core/planning/slot-finder'
import { nextDate, referenceMidnight, referenceMinAltitude } from '../support/outlook-reference'

// References:
// - Light: astronomy-engine (npm), the geometric altitude of the sun's centre sampled every minute
//   over a slot (tests/support/outlook-reference.ts); a slot in daylight keeps it at or above
//   −0.833°, in civil light at or above −6° (USNO conventions, docs/light-model.md). The light engine's own
//   altitudes were measured within 0.017° of astronomy-engine (docs/references.md): that is the tolerance.
// - Work rules: EU Working Time Directive 2003/88/EC art. 3 (11 h daily rest) and a 12 h longest
//   shift (common practice), as the planning module's conflict check applies them.
// Site: 69.6496° N 18.956° E, Europe/Oslo; the people, shifts and leave below are invented.
const PLACE = { latitude: 69.6496, longitude: 18.956, timezone: 'Europe/Oslo' }
const RULES = { minRestHours: 11, maxShiftHours: 12 }
const THRESHOLD = { daylight: -0.833, civil: -6, any: -90 } as const
const ENGINE_TOLERANCE_DEG = 0.02
const MIN = 60_000
const H = 60 * MIN
const FROM = '2027-01-18'
const TO = '2027-01-21'

const wall = (date: string, hours: number) => referenceMidnight(date, PLACE.timezone) + hours * H
const PEOPLE = [{ id: 1, name: 'Ada Test' }, { id: 2, name: 'Bo Test' }, { id: 3, name: 'Cy Test' }]

function neighbour(shiftId: number, personId: number, startMs: number, endMs: number): NeighbourShift {
  return { shiftId, personId, startMs, endMs, title: `Task ${shiftId}`, siteName: 'Test Yard' }
}

// Ada works late on the 19th (rest until 10:30 on the 20th), Bo is away until 11:00 on the 21st,
// Cy is on another task 09:30–10:30 on the 18th.
const CONTEXT: ConflictContext = {
  otherShifts: [neighbour(91, 1, wall('2027-01-19', 19), wall('2027-01-19', 23.5)), neighbour(92, 3, wall('2027-01-18', 9.5), wall('2027-01-18', 10.5))],
  unavailable: [{ personId: 2, startMs: wall('2027-01-21', 0), endMs: wall('2027-01-21', 11), reason: 'Travel' }],
  personNames: Object.fromEntries(PEOPLE.map(p => [p.id, p.name]))
}

function baseInput(overrides: Partial<SlotSearchInput> = {}): SlotSearchInput {
  return {
    days: computeLightDaysMs({ ...PLACE, from: FROM, to: nextDate(TO) }),
    from: FROM, to: TO, durationMinutes: 180, requirement: 'civil', people: PEOPLE,
    context: CONTEXT, rules: RULES, rank: 'earliest', ...overrides
  }
}

interface BruteStart { date: string, startMs: number, minAlt: number, lightOk: boolean, peopleOk: boolean }

// Every quarter hour of every local day, checked by the reference altitude and the rule check.
function bruteForce(input: SlotSearchInput): BruteStart[] {
  const out: BruteStart[] = []
  const need = input.headcount ?? input.people.length
  for (let date = input.from; date <= input.to; date = nextDate(date)) {
    const end = referenceMidnight(nextDate(date), PLACE.timezone)
    for (let s = referenceMidnight(date, PLACE.timezone); s < end; s += 15 * MIN) {
      const e = s + input.durationMinutes * MIN
      const minAlt = referenceMinAltitude(s, e, PLACE.latitude, PLACE.longitude)
      const free = input.people.filter(p => findShiftConflicts({ startMs: s, endMs: e, personIds: [p.id] }, input.context, input.rules).length === 0)
      out.push({ date, startMs: s, minAlt, lightOk: minAlt >= THRESHOLD[input.requirement], peopleOk: free.length >= need })
    }
  }
  return out
}

function engineStarts(input: SlotSearchInput): Set<number> {
  const { scans } = listValidSlotStarts(input)
  return new Set([...scans.values()].flatMap(s => s.valid.map(v => v.startMs)))
}

// Starts the reference puts within the engine's tolerance of the threshold: either answer is fair.
const isAmbiguous = (b: BruteStart, requirement: 'daylight' | 'civil') => Math.abs(b.minAlt - THRESHOLD[requirement]) < ENGINE_TOLERANCE_DEG

function expectSameStarts(input: SlotSearchInput) {
  const brute = bruteForce(input)
  const engine = engineStarts(input)
  const requirement = input.requirement as 'daylight' | 'civil'
  const missed = brute.filter(b => b.lightOk && b.peopleOk && !engine.has(b.startMs) && !isAmbiguous(b, requirement))
  const extra = brute.filter(b => !(b.lightOk && b.peopleOk) && engine.has(b.startMs) && !isAmbiguous(b, requirement))
  expect(missed.map(b => new Date(b.startMs).toISOString()), 'valid by the reference but not proposed').toEqual([])
  expect(extra.map(b => new Date(b.startMs).toISOString()), 'proposed but invalid by the reference').toEqual([])
  return { brute, engine }
}

describe('slot finder against a brute force over every quarter hour', () => {
  it('finds exactly the 2-hour daylight starts the reference finds, on short January days at 69° N', () => {
    const input = baseInput({ requirement: 'daylight', durationMinutes: 120, context: { otherShifts: [], unavailable: [], personNames: {} } })
    const { brute, engine } = expectSameStarts(input)
    // the window is tight: some days have one or two starts, the 18th (121 min of daylight, off the quarter hours) none
    expect(engine.size).toBeGreaterThan(0)
    expect(brute.filter(b => b.date === '2027-01-18' && b.lightOk)).toEqual([])
  }, 60_000)

  it('finds exactly the 3-hour civil-light starts that fit three people\'s shifts, rest and leave', () => {
    const { brute, engine } = expectSameStarts(baseInput())
    expect(engine.size).toBeGreaterThan(5)
    // the rules really bite: the reference has light-valid starts that the people rule out
    expect(brute.some(b => b.lightOk && !b.peopleOk)).toBe(true)
  }, 60_000)

  it('with a headcount of 2 of 3, finds the starts where any two are free', () => {
    const { engine } = expectSameStarts(baseInput({ headcount: 2 }))
    const all = engineStarts(baseInput())
    expect(engine.size).toBeGreaterThan(all.size)
  }, 60_000)
})

describe('proposed slots', () => {
  it('lie wholly in usable light by the reference when nothing else constrains them, at both ends of the light', () => {
    const free: ConflictContext = { otherShifts: [], unavailable: [], personNames: {} }
    for (const requirement of ['daylight', 'civil'] as const) {
      for (const rank of ['earliest', 'margin'] as const) {
        const { slots } = findSlots(baseInput({ requirement, rank, perDay: 4, durationMinutes: 60, context: free }))
        expect(slots.length).toBeGreaterThan(4)
        for (const slot of slots) {
          expect(referenceMinAltitude(slot.startMs, slot.endMs, PLACE.latitude, PLACE.longitude), `${requirement} ${rank} ${new Date(slot.startMs).toISOString()}`)
            .toBeGreaterThanOrEqual(THRESHOLD[requirement] - ENGINE_TOLERANCE_DEG)
        }
      }
    }
  }, 60_000)

  it('lie wholly in usable light by the reference and break no work rule', () => {
    for (const rank of ['earliest', 'margin'] as const) {
      const input = baseInput({ rank, perDay: 4 })
      const { slots } = findSlots(input)
      expect(slots.length).toBeGreaterThan(0)
      for (const slot of slots) {
        expect(referenceMinAltitude(slot.startMs, slot.endMs, PLACE.latitude, PLACE.longitude)).toBeGreaterThanOrEqual(-6 - ENGINE_TOLERANCE_DEG)
        expect(findShiftConflicts({ startMs: slot.startMs, endMs: slot.endMs, personIds: slot.assigneeIds }, CONTEXT, RULES)).toEqual([])
        expect(slot.assigneeIds).toEqual([1, 2, 3])
        expect(slot.endMs - slot.startMs).toBe(180 * MIN)
      }
    }
  }, 60_000)

  it('give the earliest valid start of each day that has one, in time order, aligned to the quarter hour', () => {
    const input = baseInput()
    const { slots, daysWithSlots, daysSearched } = findSlots(input)
    const { scans } = listValidSlotStarts(input)
    const expected = [...scans.values()].filter(s => s.valid.length).map(s => s.valid[0]!.startMs)
    expect(slots.map(s => s.startMs)).toEqual(expected)
    expect(daysWithSlots).toBe(expected.length)
    expect(daysSearched).toBe(4)
    for (const s of slots) expect((s.startMs - referenceMidnight(s.date, PLACE.timezone)) % (15 * MIN)).toBe(0)
    // Ada's late shift on the 19th leaves her 11 h of rest only from 10:30 on the 20th
    expect(slots.find(s => s.date === '2027-01-20')!.startMs).toBeGreaterThanOrEqual(wall('2027-01-20', 10.5))
    // Bo is away until 11:00 on the 21st
    expect(slots.find(s => s.date === '2027-01-21')!.startMs).toBeGreaterThanOrEqual(wall('2027-01-21', 11))
  }, 60_000)

  it('rank by margin puts the slot with the most light left after it first', () => {
    const { slots } = findSlots(baseInput({ rank: 'margin', perDay: 2 }))
    const after = slots.map(s => s.lightAfterMinutes!)
    expect(after).toEqual([...after].sort((a, b) => b - a))
    for (const s of slots) {
      expect(s.lightAfterMinutes).toBeGreaterThanOrEqual(0)
      expect(s.lightBeforeMinutes).toBeGreaterThanOrEqual(0)
    }
  }, 60_000)

  it('keeps slots of one day apart from one another when several are asked for', () => {
    const { slots } = findSlots(baseInput({ perDay: 3 }))
    for (const a of slots) for (const b of slots) if (a !== b) expect(a.endMs <= b.startMs || b.endMs <= a.startMs).toBe(true)
  }, 60_000)

  it('leaves out starts before "now"', () => {
    const now = wall('2027-01-20', 12)
    const { slots } = findSlots(baseInput({ notBeforeMs: now }))
    expect(slots.length).toBeGreaterThan(0)
    expect(slots.every(s => s.startMs >= now)).toBe(true)
  })
})

describe('when there is no slot, the reason says why', () => {
  it('no usable light long enough: daylight at 78° N in December, where the sun does not rise', () => {
    const input = baseInput({
      days: computeLightDaysMs({ latitude: 78.2232, longitude: 15.6267, timezone: 'Arctic/Longyearbyen', from: '2026-12-10', to: '2026-12-13' }),
      from: '2026-12-10', to: '2026-12-12', requirement: 'daylight', durationMinutes: 60, context: { otherShifts: [], unavailable: [], personNames: {} }
    })
    const outcome = findSlots(input)
    expect(outcome.slots).toEqual([])
    expect(outcome.reasonCode).toBe('light')
    expect(outcome.reason).toContain('No usable light long enough')
    expect(outcome.reason).toContain('no daylight')
  })

  it('no usable light long enough: 7 h of civil light asked for where there are about 6', () => {
    const outcome = findSlots(baseInput({ durationMinutes: 420, context: { otherShifts: [], unavailable: [], personNames: {} } }))
    expect(outcome.reasonCode).toBe('light')
    expect(outcome.reason).toMatch(/longest stretch of civil light .* is 6 h \d+ min, on Thu 21 Jan/)
  })

  it('people unavailable: one person away for the whole window', () => {
    const away: ConflictContext = { otherShifts: [], unavailable: [{ personId: 2, startMs: wall(FROM, 0), endMs: wall(nextDate(TO), 0), reason: 'Leave' }], personNames: CONTEXT.personNames }
    const outcome = findSlots(baseInput({ context: away }))
    expect(outcome.reasonCode).toBe('unavailable')
    expect(outcome.reason).toContain('Bo Test is unavailable')
    expect(outcome.reason).toContain('Leave')
  })

  it('rest rules: night shifts every night leave no 11-hour rest around any daylight start', () => {
    // 18:00–02:00 every night: 11 h of rest reach only 13:00, and the next night starts 18:00
    const nights = [-1, 0, 1, 2, 3].map(i => nextDate(FROM, i)).map((d, i) => neighbour(200 + i, 1, wall(d, 18), wall(d, 26)))
    const outcome = findSlots(baseInput({ requirement: 'daylight', durationMinutes: 60, context: { otherShifts: nights, unavailable: [], personNames: CONTEXT.personNames } }))
    expect(outcome.slots).toEqual([])
    expect(outcome.reasonCode).toBe('rest')
    expect(outcome.reason).toContain('Rest rules')
  })

  it('a task longer than the longest shift the work rules allow', () => {
    const outcome = findSlots(baseInput({ requirement: 'any', durationMinutes: 13 * 60 }))
    expect(outcome.reasonCode).toBe('max-length')
    expect(outcome.reason).toContain('13 h task is longer than the 12 h')
  })
})
