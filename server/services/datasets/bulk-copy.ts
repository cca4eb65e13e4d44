import { once } from 'node:events'
import { finished } from 'node:stream/promises'
import type { PoolClient } from 'pg'
import { from as copyFrom } from 'pg-copy-streams'
import type { DigitRecord } from '#shared/digits'

export const STATUS_CODES = { blank: 0, unreadable: 1, zero: 2, number: 3 } as const

function quoted(text: string) {
  return `"${text.replaceAll('"', '""')}"`
}

/** A PostgreSQL text[] literal; NUL cannot be stored in text and is dropped. */
function arrayLiteral(cells: readonly string[]) {
  return `{${cells.map(c => `"${c.replaceAll('\0', '').replaceAll('\\', '\\\\').replaceAll('"', '\\"')}"`).join(',')}}`
}

function field(value: number | string | null) {
  return value === null ? '' : String(value)
}

/** COPY … FROM STDIN in CSV form, written in ~1 MB pieces with backpressure. */
export class CopyWriter {
  private buffer = ''
  private readonly stream

  constructor(client: PoolClient, table: string, columns: string[]) {
    this.stream = client.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN WITH (FORMAT csv)`))
  }

  /** Adds a line to the buffer; `flush()` sends it. */
  add(text: string) {
    this.buffer += text
  }

  async flush() {
    if (!this.buffer) return
    const ok = this.stream.write(this.buffer)
    this.buffer = ''
    if (!ok) await once(this.stream, 'drain')
  }

  async end() {
    await this.flush()
    const done = once(this.stream, 'finish')
    this.stream.end()
    await done
  }

  /**
   * Abandons the COPY: PostgreSQL rolls it back and answers with an error, which is expected here
   * and must not escape as an unhandled 'error' event. Resolves once the stream has closed.
   */
  async abort() {
    const closed = finished(this.stream).catch(() => {})
    this.stream.destroy()
    await closed
  }
}

export const ROW_COLUMNS = ['dataset_id', 'row_no', 'cells']
export const DIGIT_COLUMNS = [
  'dataset_id', 'column_pos', 'row_no', 'status', 'sign', 'value', 'first_digit', 'second_digit', 'first_two',
  'first_three', 'last_two', 'integer_digits', 'trailing_zeros', 'fraction_digits', 'mantissa', 'group_codes',
]
export const GROUP_VALUE_COLUMNS = ['dataset_id', 'column_pos', 'code', 'value']

export function rowLine(datasetId: string, rowNo: number, cells: readonly string[]) {
  return `${datasetId},${rowNo},${quoted(arrayLiteral(cells))}\n`
}

/** `groupCodes` is the row's text columns as an int[] literal (GroupCodes.literal). */
export function digitLine(datasetId: string, columnPos: number, rowNo: number, r: DigitRecord, groupCodes: string) {
  return `${datasetId},${columnPos},${rowNo},${STATUS_CODES[r.status]},${r.sign},${field(r.value)},${field(r.firstDigit)},${field(r.secondDigit)},${field(r.firstTwo)},${field(r.firstThree)},${field(r.lastTwo)},${r.integerDigits},${r.trailingZeros},${r.fractionDigits},${field(r.mantissa)},${groupCodes}\n`
}
