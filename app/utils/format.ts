const numberFormat = new Intl.NumberFormat('en-GB')

export function formatCount(value: number | null | undefined): string {
  return value === null || value === undefined ? '—' : numberFormat.format(value)
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`
}

// Dates live with the server's: one format on every page, in every e-mail and message.
export { formatDate, formatDateTime } from '#shared/format/dates'

/** A difference with fixed decimals: one too small to show is 0, never "-0.00000" or an exponent. */
export function formatDifference(value: number | null | undefined, digits = 5): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  const text = value.toFixed(digits)
  return Number(text) === 0 ? (0).toFixed(digits) : text
}

/** A statistic with fixed decimals; very small values keep their magnitude visible. */
export function formatStatistic(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (value !== 0 && Math.abs(value) < 10 ** -digits) return value.toExponential(1)
  return value.toFixed(digits)
}

/** "1 live link", "3 live links": a count with its noun in the right number. */
export function countOf(count: number, singular: string, plural = `${singular}s`): string {
  return `${formatCount(count)} ${count === 1 ? singular : plural}`
}
