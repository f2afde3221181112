import { describe, expect, it } from 'vitest'
import { lookupWarmupSchedule } from '../../server/core/cold/index'

// ACGIH TLVs work/warm-up schedule for a 4-hour shift (after the Saskatchewan Department of Labour),
// as reproduced by OSHA and CCOHS and transcribed in docs/references.md: moderate to heavy work.
// Each cell: [max work minutes (null = normal breaks), number of breaks], or 'stop'.
// Columns: no noticeable wind, 8, 16, 24, 32 km/h.
type Cell = [number | null, number] | 'stop'
const N: Cell = [null, 1]
const PUBLISHED_ROWS: { temps: [number, number], cells: Cell[] }[] = [
  { temps: [-26, -28], cells: [N, N, [75, 2], [55, 3], [40, 4]] },
  { temps: [-29, -31], cells: [N, [75, 2], [55, 3], [40, 4], [30, 5]] },
  { temps: [-32, -34], cells: [[75, 2], [55, 3], [40, 4], [30, 5], 'stop'] },
  { temps: [-35, -37], cells: [[55, 3], [40, 4], [30, 5], 'stop', 'stop'] },
  { temps: [-38, -39], cells: [[40, 4], [30, 5], 'stop', 'stop', 'stop'] },
  { temps: [-40, -42], cells: [[30, 5], 'stop', 'stop', 'stop', 'stop'] },
  // "−43 and below": its warmest degree and a far colder one.
  { temps: [-43, -60], cells: ['stop', 'stop', 'stop', 'stop', 'stop'] }
]
const COLUMN_WINDS_KMH = [0, 8, 16, 24, 32]

function expectCell(tempC: number, windKmh: number, cell: Cell): void {
  const schedule = lookupWarmupSchedule(tempC, windKmh, 'moderate-heavy', { sunUp: true })
  if (cell === 'stop') {
    expect(schedule).toMatchObject({ kind: 'stop', stopWork: true, maxWorkMinutes: 0, breaks: null })
  } else {
    expect(schedule).toMatchObject({ stopWork: false, maxWorkMinutes: cell[0], breaks: cell[1] })
    expect(schedule.kind).toBe(cell[0] === null ? 'normal-breaks' : 'limited')
  }
}

describe('lookupWarmupSchedule against the ACGIH 4-hour work/warm-up schedule', () => {
  for (const row of PUBLISHED_ROWS) {
    for (const tempC of row.temps) {
      it(`gives the published cells at ${tempC} °C for every wind column`, () => {
        COLUMN_WINDS_KMH.forEach((wind, i) => expectCell(tempC, wind, row.cells[i]!))
      })
    }
  }

  it('reads a wind just above a column in the next column up (conservative reading)', () => {
    // Row −29 to −31: none → normal/1, 8 → 75/2, 16 → 55/3, 24 → 40/4, 32 → 30/5.
    expect(lookupWarmupSchedule(-30, 0.1, 'moderate-heavy').column.windKmh).toBe(8)
    expectCell(-30, 0.1, [75, 2])
    expectCell(-30, 8.1, [55, 3])
    expectCell(-30, 16.1, [40, 4])
    expectCell(-30, 24.1, [30, 5])
  })

  it('uses the last column for wind above 32 km/h and flags it', () => {
    const schedule = lookupWarmupSchedule(-30, 45, 'moderate-heavy')
    expect(schedule).toMatchObject({ maxWorkMinutes: 30, breaks: 5, windBeyondTable: true })
    expect(schedule.column.windKmh).toBe(32)
    expect(lookupWarmupSchedule(-30, 32, 'moderate-heavy').windBeyondTable).toBe(false)
  })

  it('rounds a temperature between rows toward colder (−28.4 °C is read in the −29 to −31 row)', () => {
    const schedule = lookupWarmupSchedule(-28.4, 8, 'moderate-heavy')
    expect(schedule.row).toMatchObject({ warmestC: -29, coldestC: -31 })
    expect(schedule).toMatchObject({ maxWorkMinutes: 75, breaks: 2 })
    expect(lookupWarmupSchedule(-39.5, 0, 'moderate-heavy').row?.warmestC).toBe(-40)
    expect(lookupWarmupSchedule(-42.1, 0, 'moderate-heavy').kind).toBe('stop')
  })

  it('applies normal breaks above −26 °C, where the table sets no schedule', () => {
    const schedule = lookupWarmupSchedule(-25, 32, 'moderate-heavy')
    expect(schedule).toMatchObject({ kind: 'outside-table', maxWorkMinutes: null, breaks: null, stopWork: false, row: null })
    expect(lookupWarmupSchedule(-5, 60, 'moderate-heavy').kind).toBe('outside-table')
    // −25.5 °C read toward colder is −26 °C, the table's first row.
    expect(lookupWarmupSchedule(-25.5, 16, 'moderate-heavy')).toMatchObject({ maxWorkMinutes: 75, breaks: 2 })
  })

  it('uses the next colder row for light work, as the table\'s note directs', () => {
    expect(lookupWarmupSchedule(-26, 8, 'light')).toMatchObject({ maxWorkMinutes: 75, breaks: 2, lightWorkShifted: true })
    expect(lookupWarmupSchedule(-40, 0, 'light').kind).toBe('stop')
    expect(lookupWarmupSchedule(-38, 0, 'light')).toMatchObject({ maxWorkMinutes: 30, breaks: 5 })
    // Already in the coldest row: nothing colder to move to.
    expect(lookupWarmupSchedule(-45, 0, 'light')).toMatchObject({ kind: 'stop', lightWorkShifted: false })
  })

  it('leaves light work above −26 °C on normal breaks (the shift applies within the table)', () => {
    expect(lookupWarmupSchedule(-24, 16, 'light')).toMatchObject({ kind: 'outside-table', lightWorkShifted: false })
  })

  it('reads imperial wind against the table\'s own mph columns (5, 10, 15, 20 mph)', () => {
    // 5 mph = 8.05 km/h: the 5 mph column when read in mph, the next km/h column when read in km/h.
    const kmh = 5 * 1.609344
    expect(lookupWarmupSchedule(-30, kmh, 'moderate-heavy', { windColumnUnits: 'mph' })).toMatchObject({ maxWorkMinutes: 75, breaks: 2 })
    expect(lookupWarmupSchedule(-30, kmh, 'moderate-heavy', { windColumnUnits: 'kmh' })).toMatchObject({ maxWorkMinutes: 55, breaks: 3 })
  })

  it('raises the sunshine caution unless the sun is known to be up (the table assumes a sunny sky)', () => {
    expect(lookupWarmupSchedule(-30, 8, 'moderate-heavy', { sunUp: true }).sunCaution).toBe(false)
    expect(lookupWarmupSchedule(-30, 8, 'moderate-heavy', { sunUp: false }).sunCaution).toBe(true)
    expect(lookupWarmupSchedule(-30, 8, 'moderate-heavy').sunCaution).toBe(true)
    expect(lookupWarmupSchedule(-10, 8, 'moderate-heavy', { sunUp: false }).sunCaution).toBe(false)
  })

  it('explains how it read the table in its notes', () => {
    const notes = lookupWarmupSchedule(-28.4, 9, 'light', { sunUp: false }).notes.join(' ')
    expect(notes).toMatch(/toward colder/)
    expect(notes).toMatch(/next colder row/)
    expect(notes).toMatch(/16 km\/h/)
    expect(notes).toMatch(/sunny sky/)
  })
})
