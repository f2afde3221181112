// Reads an uploaded spreadsheet (CSV text) into numbered rows for the import previews. Row numbers
// are the ones a spreadsheet shows: the header is row 1, so the first data row is row 2, and blank
// rows keep their numbers. No framework imports.
import Papa from 'papaparse'
import { z } from 'zod'

/** The most data rows one import takes; a larger file is refused whole. */
export const MAX_IMPORT_ROWS = 10_000
/** The most characters an uploaded CSV may have (about 2 kB a row at the row limit). */
export const MAX_IMPORT_CSV_CHARS = 20_000_000

/** The body of the import routes: the file's text. */
export const ImportBodySchema = z.object({
  csv: z.string({ error: 'expected the CSV file as text' }).max(MAX_IMPORT_CSV_CHARS, `the file is larger than ${MAX_IMPORT_CSV_CHARS / 1_000_000} million characters`)
})

export interface CsvRow {
  row: number
  cells: Map<string, string>
  errors: string[]
}

export interface CsvTable {
  rows: CsvRow[]
  errors: string[]
}

const BINARY_SAMPLE_CHARS = 4096
// control characters other than tab, line feed, form feed and carriage return
// eslint-disable-next-line no-control-regex
const CONTROL_RE = /[\u0000-\u0008\u000B\u000E-\u001F\uFFFD]/g

/** True for text that is not CSV: a zip (.xlsx, .ods), NUL bytes, or many control characters. */
export function looksLikeBinary(text: string): boolean {
  const sample = text.slice(0, BINARY_SAMPLE_CHARS)
  if (sample.startsWith('PK\u0003\u0004') || sample.includes('\u0000')) return true
  const controls = sample.match(CONTROL_RE)?.length ?? 0
  return controls > Math.max(2, sample.length * 0.01)
}

function readHeader(cells: string[], required: string[], optional: string[]) {
  const names = cells.map(c => c.trim().toLowerCase())
  const known = [...required, ...optional]
  if (!names.some(n => known.includes(n))) {
    return { errors: [`The first row must be the header: ${known.join(',')}`] }
  }
  const missing = required.filter(c => !names.includes(c))
  const doubled = known.filter(c => names.filter(n => n === c).length > 1)
  const errors = [
    ...missing.map(c => `Missing column: ${c} (the header needs ${required.join(', ')})`),
    ...doubled.map(c => `The column ${c} appears more than once`)
  ]
  return { errors, names }
}

function toRow(index: number, cells: string[], names: string[]): CsvRow {
  const map = new Map<string, string>()
  names.forEach((name, i) => {
    if (name && !map.has(name)) map.set(name, (cells[i] ?? '').trim())
  })
  const extra = cells.slice(names.length).filter(c => c.trim() !== '')
  const errors = extra.length ? [`has ${cells.length} values but the header has ${names.length} columns`] : []
  return { row: index + 1, cells: map, errors }
}

function parseRecords(text: string) {
  const parsed = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false, delimitersToGuess: [',', ';', '\t'] })
  const quoteErrors = new Map<number, string>()
  for (const e of parsed.errors) {
    if (e.type === 'Quotes' && typeof e.row === 'number') quoteErrors.set(e.row, 'a quoted value is not closed (check the quotation marks)')
  }
  return { records: parsed.data, quoteErrors }
}

/**
 * Reads CSV text with a header naming the columns (any order, any case; extra columns ignored).
 * File-level problems (empty, not text, no header, a missing column, too many rows) come back in
 * `errors` with no rows.
 */
export function readCsvTable(csv: string, required: string[], optional: string[] = []): CsvTable {
  const text = csv.replace(/^\uFEFF/, '')
  if (!text.trim()) return { rows: [], errors: ['The file is empty'] }
  if (looksLikeBinary(text)) {
    return { rows: [], errors: ['This is not a CSV text file (it looks like binary data, such as a workbook saved as .xlsx). Save it as CSV and try again.'] }
  }
  const { records, quoteErrors } = parseRecords(text)
  const header = readHeader(records[0] ?? [], required, optional)
  if (!header.names || header.errors.length) return { rows: [], errors: header.errors }
  const rows: CsvRow[] = []
  for (let i = 1; i < records.length; i++) {
    const cells = records[i]!
    if (cells.every(c => c.trim() === '')) continue
    const row = toRow(i, cells, header.names)
    const quoteError = quoteErrors.get(i)
    if (quoteError) row.errors.push(quoteError)
    rows.push(row)
  }
  if (!rows.length) return { rows: [], errors: ['The file has a header but no rows'] }
  if (rows.length > MAX_IMPORT_ROWS) {
    return { rows: [], errors: [`The file has ${rows.length.toLocaleString('en')} rows; at most ${MAX_IMPORT_ROWS.toLocaleString('en')} can be imported at once. Split it into smaller files.`] }
  }
  return { rows, errors: [] }
}

/** A CSV text from a header and rows, quoting where needed. */
export function writeCsvText(header: string[], rows: string[][]): string {
  return Papa.unparse({ fields: header, data: rows }, { newline: '\r\n' }) + '\r\n'
}
