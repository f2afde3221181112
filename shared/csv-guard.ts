// CSV injection guard (OWASP "CSV Injection": a cell that starts with = + - @, tab or carriage return
// can run as a formula in a spreadsheet; common practice is to prefix it with a single quote). Pure.
//
// Papa Parse's own `escapeFormulae: true` tests /^[=+\-@\t\r].*$/: without the s flag `.*$` cannot
// cross a line break, so "=HYPERLINK(…)\nmore" slipped through unescaped. This pattern looks only at
// the first character, and counts a leading line feed too.
export const CSV_FORMULA_GUARD = /^[=+\-@\t\r\n]/
