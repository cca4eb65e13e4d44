/**
 * CSV text that spreadsheets open safely: a text cell starting with =, +, -, @, tab or carriage
 * return is prefixed with an apostrophe, so it is shown as text and never run as a formula
 * (the OWASP advice on CSV injection). Numbers are written as numbers, and so is a text that is
 * only a plain decimal number ("-1250.5", a bin of negative amounts): it runs nothing.
 */
export function toCsv(rows: readonly (readonly (string | number | null | undefined)[])[]): string {
  return rows.map(row => row.map(csvCell).join(',')).join('\r\n') + '\r\n'
}

const PLAIN_NUMBER = /^-?\d+(\.\d+)?$/

/** A text that a spreadsheet could run as a formula, shown as text instead (OWASP, CSV injection). */
export function inertText(value: string): string {
  return /^[=+\-@\t\r]/.test(value) && !PLAIN_NUMBER.test(value) ? `'${value}` : value
}

function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : ''
  const safe = inertText(value)
  return /[",\r\n]/.test(safe) ? `"${safe.replaceAll('"', '""')}"` : safe
}
