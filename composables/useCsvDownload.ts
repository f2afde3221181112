import Papa from 'papaparse'

// escapeFormulae: a cell starting with = + - @ is quoted so a spreadsheet does not run it (CSV injection)

/** Saves rows as a CSV file in the browser (nothing goes to the server). */
export function useCsvDownload() {
  function download(fileName: string, rows: Record<string, unknown>[], columns?: string[]) {
    const csv = Papa.unparse(rows, { columns, newline: '\r\n', escapeFormulae: true })
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
