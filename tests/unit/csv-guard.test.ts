// The CSV export's formula guard (shared/csv-guard.ts) with Papa Parse 5.7.1, the writer the export
// uses. Source: OWASP, "CSV Injection" (cells beginning = + - @, tab, carriage return are read as
// formulas; prefix them with a single quote) — the rule as commonly practised, quoted from memory.
import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { CSV_FORMULA_GUARD } from '../../shared/csv-guard'

function cellOf(value: string, escapeFormulae: boolean | RegExp) {
  const csv = Papa.unparse([{ title: value }], { columns: ['title'], newline: '\r\n', escapeFormulae })
  return Papa.parse<string[]>(csv).data[1]![0]!
}

describe('the CSV export formula guard', () => {
  it.each(['=1+1', '+1', '-1', '@SUM(A1)', '\t=1', '\r=1', '=HYPERLINK("http://x.test")\nsecond line', '=1+1\r\nmore', '\n=1+1'])('prefixes %j with a quote', (value) => {
    expect(cellOf(value, CSV_FORMULA_GUARD)).toBe(`'${value}`)
  })

  it('leaves ordinary text as it is, line breaks included', () => {
    for (const value of ['Line patrol', 'Night 1 = dark', 'first\nsecond', 'a+b']) expect(cellOf(value, CSV_FORMULA_GUARD)).toBe(value)
  })

  it('closes the gap in Papa Parse\'s own pattern: a formula followed by a line break', () => {
    const value = '=HYPERLINK("http://x.test")\nsecond line'
    expect(cellOf(value, true)).toBe(value) // Papa's default lets it through unescaped
    expect(cellOf(value, CSV_FORMULA_GUARD)).toBe(`'${value}`)
  })
})
