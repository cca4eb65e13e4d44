/**
 * CSV text that spreadsheets open safely: a text cell starting with =, +, -, @, tab or carriage
 * return is prefixed with an apostrophe, so it is shown as text and never run as a formula
 * (the OWASP advice on CSV injection). Numbers are written as numbers.
 */
export function toCsv(rows: readonly (readonly (string | number | null | undefined)[])[]): string {
  return rows.map(row => row.map(csvCell).join(',')).join('\r\n') + '\r\n'
}

function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : ''
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value
  return /[",\r\n]/.test(safe) ? `"${safe.replaceAll('"', '""')}"` : safe
}
