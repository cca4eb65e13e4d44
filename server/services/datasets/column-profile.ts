import type { DigitRecord } from '#shared/digits'
import { looksLikeDate } from '#shared/dates/read-date'
import { SignProfile, compareValues } from './sign-profile'

export const COLUMN_KINDS = ['amount', 'count', 'date', 'text', 'identifier'] as const
export type ColumnKind = typeof COLUMN_KINDS[number]

const SAMPLES = 5
const ID_NAME = /(^|[\s_-])(id|code|zip|postcode|phone|account|iban|ref|reference|no|nr|number)($|[\s_.-])/i
const CODE_TEXT = /^[A-Za-z]{0,6}[-_/ ]?\d{3,}[A-Za-z]?$/
const DATE_LIKE = 1
const CODE_LIKE = 2

/** The first `length` UTF-16 units of `text`, never ending on half of a surrogate pair (an emoji), which jsonb refuses. */
export function clip(text: string, length: number): string {
  if (text.length <= length) return text
  const code = text.charCodeAt(length - 1)
  return text.slice(0, code >= 0xD800 && code <= 0xDBFF ? length - 1 : length)
}

/** What an import learns about one column while the rows stream past. */
export class ColumnProfile {
  blank = 0
  parsed = 0
  unreadable = 0
  zero = 0
  negative = 0
  whole = 0
  dateLike = 0
  codeLike = 0
  min: { n: number, text: string } | null = null
  max: { n: number, text: string } | null = null
  minAbs = Infinity
  maxAbs = 0
  /** Non-blank cells of a column read as text. */
  textOnly = 0
  readonly lengths = new Map<number, number>()
  readonly samples: string[] = []
  private readonly looksByCode: number[] = []
  readonly bySign = { positive: new SignProfile(), negative: new SignProfile() }

  /**
   * `told`: the kind a reporter gave the column, which the counts then no longer decide; `numbersTold`:
   * they said how its numbers are written, so it holds numbers however few of its cells read.
   */
  constructor(
    readonly name: string, readonly numeric: boolean, readonly decimalMark: '.' | ',' | null,
    readonly told: ColumnKind | null = null, readonly numbersTold = false,
  ) {}

  private sample(cell: string) {
    if (this.samples.length < SAMPLES && !this.samples.includes(cell)) this.samples.push(clip(cell, 200))
  }

  /** `code` is the cell's group code (group-codes.ts), 0 when it has none: a coded text's looks are worked out once. */
  addText(cell: string, code = 0) {
    const text = cell.trim()
    if (!text) {
      this.blank++
      return
    }
    this.textOnly++
    this.sample(text)
    let looks = code ? this.looksByCode[code] : undefined
    if (looks === undefined) {
      looks = (looksLikeDate(text) ? DATE_LIKE : 0) | (CODE_TEXT.test(text) ? CODE_LIKE : 0)
      if (code) this.looksByCode[code] = looks
    }
    if (looks & DATE_LIKE) this.dateLike++
    if (looks & CODE_LIKE) this.codeLike++
  }

  addNumber(cell: string, record: DigitRecord) {
    if (record.status === 'blank') {
      this.blank++
      return
    }
    this.sample(cell.trim())
    if (record.status === 'unreadable') {
      this.unreadable++
      if (looksLikeDate(cell)) this.dateLike++
      return
    }
    this.parsed++
    if (record.status === 'zero') {
      this.zero++
      this.whole++
      this.track(0, '0')
      return
    }
    this.bySign[record.sign < 0 ? 'negative' : 'positive'].add(record)
    if (record.sign < 0) this.negative++
    if (record.fractionDigits === 0) this.whole++
    this.lengths.set(record.integerDigits, (this.lengths.get(record.integerDigits) ?? 0) + 1)
    const n = Number(record.value)
    this.track(n, record.value!)
    const abs = Math.abs(n)
    if (abs < this.minAbs) this.minAbs = abs
    if (abs > this.maxAbs) this.maxAbs = abs
  }

  private track(n: number, text: string) {
    if (!this.min || compareValues(n, text, this.min.n, this.min.text) < 0) this.min = { n, text }
    if (!this.max || compareValues(n, text, this.max.n, this.max.text) > 0) this.max = { n, text }
  }

  /** Orders of magnitude between the smallest and largest non-zero absolute value. */
  get magnitudeSpan(): number | null {
    return this.maxAbs > 0 && Number.isFinite(this.minAbs) ? Math.log10(this.maxAbs) - Math.log10(this.minAbs) : null
  }

  get kind(): ColumnKind {
    if (this.told) return this.told
    const nonBlank = this.parsed + this.unreadable + this.textOnly
    const mostlyNumbers = this.numeric && (this.numbersTold || this.parsed >= Math.max(1, 0.5 * nonBlank))
    if (!mostlyNumbers) {
      if (nonBlank && this.dateLike >= 0.8 * nonBlank) return 'date'
      if (nonBlank && this.codeLike >= 0.9 * nonBlank && ID_NAME.test(this.name)) return 'identifier'
      return 'text'
    }
    const numbers = this.parsed - this.zero
    const commonLength = Math.max(0, ...this.lengths.values())
    const allWhole = this.whole === this.parsed
    // Assigned numbers (ids, codes) have no fractional part and mostly one length, or say so in their name.
    if (allWhole && (ID_NAME.test(this.name) || (numbers > 20 && commonLength >= 0.95 * numbers && this.minAbs >= 1000))) return 'identifier'
    if (allWhole && this.negative === 0) return 'count'
    return 'amount'
  }
}
