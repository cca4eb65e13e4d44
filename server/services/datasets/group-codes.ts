import { dayPart, looksLikeDate } from '#shared/dates/read-date'

/** More distinct values than this and a column is not coded: grouping by it falls back to a join. */
export const MAX_CODES = 100_000

const unprintable = (code: number) => code <= 32 || code >= 127

/** In the sample, a column where nearly every value differs (references, ids, notes) is not coded. */
const UNIQUE_SHARE = 0.9
const SAMPLE_MINIMUM = 100
/**
 * A column whose sample reads this much as dates (the share at which its profile calls it a date
 * column) is coded however few of its dates repeat: a short ledger pays on a different day nearly
 * every time, yet days are few by nature (36,525 a century), and only a coded column's dates are read
 * as days (its range under a chart, date filters, periods).
 */
const DATE_SHARE = 0.8

/**
 * A text longer than this stops its column being coded too: the dictionary's values are indexed,
 * and PostgreSQL refuses an index entry over about 2,700 bytes (a 1 MB cell failed the import).
 * 500 characters are at most 2,000 bytes of UTF-8; no vendor or department name is that long.
 */
export const MAX_CODED_LENGTH = 500

/**
 * The text a cell of a coded column is coded by: the cell trimmed, or in a column of timestamps
 * (`timed`) the date it names when it has a time of day. The cells list finds a date column's
 * unreadable cells by it (cells.ts), so it must stay the one rule.
 */
export function codedText(cell: string, timed: boolean): string {
  const text = cell.trim()
  return timed ? dayPart(text) ?? text : text
}

/**
 * Gives each distinct (trimmed) text of a column a small integer (a column of timestamps: each date), so digit records can carry
 * their row's text columns as codes. A column with too many distinct values, or one too long, stops being coded.
 */
export class GroupCodes {
  private readonly codes: (Map<string, number> | null)[]
  /** Per coded column, how many rows hold each code (a date column's profile counts rows by them). */
  private readonly rows: number[][]
  private readonly row: Int32Array
  /**
   * Columns of dates written with a time of day (timestamps): coded by the date alone, since nearly
   * every timestamp differs and it is the day that ranges and periods need. Per column, how many
   * rows had a time set aside (null: not such a column).
   */
  private readonly timed: (number | null)[]

  constructor(textPositions: boolean[], sample: readonly string[][]) {
    this.timed = textPositions.map((isText, i) => {
      if (!isText) return null
      const filled = sample.filter(row => (row[i] ?? '').trim())
      return filled.length && filled.filter(row => dayPart(row[i]!) !== null).length >= 0.5 * filled.length ? 0 : null
    })
    this.codes = textPositions.map((isText, i) => {
      if (!isText) return null
      const cells = sample.map(row => (row[i] ?? '').trim())
      const filled = cells.filter(Boolean)
      if (filled.length && filled.filter(looksLikeDate).length >= DATE_SHARE * filled.length) return new Map()
      const distinct = new Set(cells.map(cell => this.keyOf(i, cell, false))).size
      return sample.length >= SAMPLE_MINIMUM && distinct > UNIQUE_SHARE * sample.length ? null : new Map()
    })
    this.rows = textPositions.map(() => [])
    this.row = new Int32Array(textPositions.length)
  }

  /** The text a (trimmed) cell is coded by (codedText), counting a timestamp's time set aside when `count`. */
  private keyOf(position: number, text: string, count: boolean): string {
    if (this.timed[position] === null) return text
    const key = codedText(text, true)
    if (count && key !== text) this.timed[position]!++
    return key
  }

  /** How many rows of a column of timestamps had their time of day set aside (null: not such a column). */
  timedRows(position: number): number | null {
    return this.isCoded(position) ? this.timed[position] ?? null : null
  }

  /**
   * The codes of the row whose cells start at `from`, one per column: 0 for number columns and for a column that is not coded.
   * The array is reused for the next row: read it before asking again.
   */
  codesOf(cells: readonly string[], from = 0): Int32Array {
    const codes = this.row
    codes.fill(0)
    for (let i = 0; i < this.codes.length; i++) {
      const map = this.codes[i]
      if (!map) continue
      const cell = cells[from + i]!
      // Most cells start and end in a printable ASCII character and need no trimming (which copies).
      const trimmed = cell.length && (unprintable(cell.charCodeAt(0)) || unprintable(cell.charCodeAt(cell.length - 1))) ? cell.trim() : cell
      const text = this.keyOf(i, trimmed, true)
      let code = map.get(text)
      if (code === undefined) {
        if (map.size >= MAX_CODES || text.length > MAX_CODED_LENGTH) {
          this.codes[i] = null
          continue
        }
        code = map.size + 1
        map.set(text, code)
        this.rows[i]![code] = 0
      }
      this.rows[i]![code]!++
      codes[i] = code
    }
    return codes
  }

  isCoded(position: number): boolean {
    return this.codes[position] !== null && this.codes[position] !== undefined
  }

  /** A coded column's texts with their codes and how many rows hold each. */
  * valuesOf(position: number): Generator<[value: string, code: number, rows: number]> {
    const map = this.codes[position]
    if (!map) return
    for (const [value, code] of map) yield [value, code, this.rows[position]![code]!]
  }

  /** Every coded text with its column position and code, for the dictionary table. */
  * dictionary(): Generator<[position: number, code: number, value: string]> {
    for (const [position, map] of this.codes.entries()) {
      if (!map) continue
      for (const [value, code] of map) yield [position, code, value]
    }
  }
}
