/**
 * Reading calendar dates from the way people write them in ledgers: 2025-03-15 (with or without a
 * time of day, in any of these forms), 2025/03/15, 15/03/2025, 03/15/2025, 15.03.2025, 15-03-25, 15 March 2025, 15-Mar-2025,
 * March 15, 2025. Whether 03/04/2025 is the 3rd of April or the 4th of March cannot be told from one
 * cell, so a column is read in one order, settled by its own values (a first part above 12 is a day).
 * A day is the number of days since 1970-01-01 (UTC), so that periods and ranges compare as integers.
 */

export type DateOrder = 'ymd' | 'dmy' | 'mdy'

const MONTHS = ['january', 'february', 'march', 'april', 'may', 'june', 'july', 'august', 'september', 'october', 'november', 'december']

const ISO = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})(?:[T ]\d{1,2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/
const NUMERIC = /^(\d{1,2})[-/.](\d{1,2})[-/.](\d{2}|\d{4})(?:[T ]\d{1,2}:\d{2}(?::\d{2})?)?$/
const DAY_MONTH_NAME = /^(\d{1,2})(?:st|nd|rd|th)?[-\s.]+([a-z]{3,9})\.?,?[-\s.]+(\d{2}|\d{4})$/i
const MONTH_NAME_DAY = /^([a-z]{3,9})\.?\s+(\d{1,2})(?:st|nd|rd|th)?,?\s+(\d{4})$/i

function monthOf(name: string): number | null {
  // "Mar", "March", "Sept" and "September" are months; "Marzipan" is not.
  const lower = name.toLowerCase()
  const index = MONTHS.findIndex(month => month.startsWith(lower))
  return lower.length >= 3 && index >= 0 ? index + 1 : null
}

/** A two-digit year as POSIX strptime reads %y: 69–99 are 1969–1999, 00–68 are 2000–2068. */
function fullYear(text: string): number {
  const year = Number(text)
  if (text.length === 4) return year
  return year >= 69 ? 1900 + year : 2000 + year
}

/** Days since 1970-01-01 of a date that exists, or null (2025-02-30 does not). */
export function dayNumber(year: number, month: number, day: number): number | null {
  if (year < 1 || year > 9999 || month < 1 || month > 12 || day < 1 || day > 31) return null
  const date = new Date(Date.UTC(2000, month - 1, day))
  date.setUTCFullYear(year)
  if (date.getUTCFullYear() !== year || date.getUTCMonth() !== month - 1 || date.getUTCDate() !== day) return null
  return Math.round(date.getTime() / 86_400_000)
}

/** The day back as YYYY-MM-DD. */
export function dayText(day: number): string {
  const date = new Date(day * 86_400_000)
  const year = String(date.getUTCFullYear()).padStart(4, '0')
  return `${year}-${String(date.getUTCMonth() + 1).padStart(2, '0')}-${String(date.getUTCDate()).padStart(2, '0')}`
}

/** The day of a YYYY-MM-DD text (a filter's bound), or null. */
export function dayOfIso(text: string): number | null {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text)
  return match ? dayNumber(Number(match[1]), Number(match[2]), Number(match[3])) : null
}

const TIME = /^(.*\d)(?:T|\s+)\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?(?:\s*(?:Z|[+-]\d{2}(?::?\d{2})?))?$/i

/**
 * The date part of a date written with a time of day ("2026-03-31 14:05", "2026-03-31T14:05:09Z",
 * "31/03/2026 09:30", "2026-03-31T23:30:00-05:00"), or null when the text has no time after a date.
 * The day is the one written: an offset is not applied, as a ledger's dates are the payer's own.
 */
export function dayPart(text: string): string | null {
  const match = TIME.exec(text.trim())
  if (!match) return null
  const date = match[1]!
  return ISO.test(date) || NUMERIC.test(date) || DAY_MONTH_NAME.test(date) || MONTH_NAME_DAY.test(date) ? date : null
}

/** Whether a text is written like a date in one of the forms above (the column's kind). */
export function looksLikeDate(text: string): boolean {
  const t = text.trim()
  if (ISO.test(t) || NUMERIC.test(t)) return true
  const day = dayPart(t)
  if (day !== null) return looksLikeDate(day)
  const named = DAY_MONTH_NAME.exec(t) ?? MONTH_NAME_DAY.exec(t)
  return Boolean(named && monthOf(/^\d/.test(named[1]!) ? named[2]! : named[1]!))
}

/**
 * The order a column's all-numeric dates are written in, from its own values: a first part above 12
 * can only be a day, a second part above 12 only a day. `settled` is false when no value tells
 * (every part 12 or under): the column is then read day first, and the profile says so.
 */
export function detectDateOrder(texts: Iterable<string>): { order: DateOrder, settled: boolean } {
  let dayFirst = false
  let monthFirst = false
  let numeric = false
  for (const text of texts) {
    const match = NUMERIC.exec(text.trim())
    if (!match) continue
    numeric = true
    if (Number(match[1]) > 12) dayFirst = true
    if (Number(match[2]) > 12) monthFirst = true
  }
  if (!numeric) return { order: 'ymd', settled: true }
  if (monthFirst && !dayFirst) return { order: 'mdy', settled: true }
  return { order: 'dmy', settled: dayFirst && !monthFirst }
}

/** The day a text names, read with the column's order for all-numeric forms; null when it is no date. */
export function readDate(text: string, order: DateOrder): number | null {
  const t = dayPart(text) ?? text.trim()
  let match = ISO.exec(t)
  if (match) return dayNumber(Number(match[1]), Number(match[2]), Number(match[3]))
  match = NUMERIC.exec(t)
  if (match) {
    const [first, second] = [Number(match[1]), Number(match[2])]
    const year = fullYear(match[3]!)
    return order === 'mdy' ? dayNumber(year, first, second) : dayNumber(year, second, first)
  }
  match = DAY_MONTH_NAME.exec(t)
  if (match) {
    const month = monthOf(match[2]!)
    return month ? dayNumber(fullYear(match[3]!), month, Number(match[1])) : null
  }
  match = MONTH_NAME_DAY.exec(t)
  if (match) {
    const month = monthOf(match[1]!)
    return month ? dayNumber(Number(match[3]), month, Number(match[2])) : null
  }
  return null
}

export const PERIODS = ['year', 'quarter', 'month'] as const
export type Period = typeof PERIODS[number]

/** The period a day falls in, as sortable text: "2025", "2025-Q1", "2025-03". */
export function periodOf(day: number, period: Period): string {
  const text = dayText(day)
  if (period === 'year') return text.slice(0, 4)
  if (period === 'month') return text.slice(0, 7)
  return `${text.slice(0, 4)}-Q${Math.floor((Number(text.slice(5, 7)) - 1) / 3) + 1}`
}

/** The first and last day (YYYY-MM-DD) of a period label as periodOf writes it, or null for another text. */
export function periodRange(label: string): { from: string, to: string } | null {
  const match = /^(\d{4})(?:-Q([1-4])|-(\d{2}))?$/.exec(label)
  if (!match) return null
  const year = Number(match[1])
  const [first, last] = match[2] ? [3 * Number(match[2]) - 2, 3 * Number(match[2])] : match[3] ? [Number(match[3]), Number(match[3])] : [1, 12]
  const from = dayNumber(year, first, 1)
  const to = dayNumber(last === 12 ? year + 1 : year, last === 12 ? 1 : last + 1, 1)
  return from === null || to === null ? null : { from: dayText(from), to: dayText(to - 1) }
}
