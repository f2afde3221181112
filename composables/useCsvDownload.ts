import Papa from 'papaparse'
import { CSV_FORMULA_GUARD } from '#shared/csv-guard'

// escapeFormulae: a cell starting with = + - @ (or a tab or line break) gets a leading quote so a
// spreadsheet does not run it (CSV injection); shared/csv-guard.ts says why not Papa's own pattern

/** Saves rows as a CSV file in the browser (nothing goes to the server). */
export function useCsvDownload() {
  function download(fileName: string, rows: Record<string, unknown>[], columns?: string[]) {
    const csv = Papa.unparse(rows, { columns, newline: '\r\n', escapeFormulae: CSV_FORMULA_GUARD })
    const url = URL.createObjectURL(new Blob([csv], { type: 'text/csv;charset=utf-8' }))
    const link = document.createElement('a')
    link.href = url
    link.download = fileName
    document.body.appendChild(link)
    link.click()
    link.remove()
    setTimeout(() => URL.revokeObjectURL(url), 1000)
  }
  return { download }
}
