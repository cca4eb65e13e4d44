import type { DigitRecord, ReadNumber } from '#shared/digits'
import { STATUS_CODES } from './digit-columns'

const CHUNK_BYTES = 1 << 20
const SIGNATURE = Buffer.from('PGCOPY\n\xff\r\n\0', 'latin1')
const TEXT_OID = 25
const INT4_OID = 23
const FLOAT8_OID = 701
const NUMERIC_NEGATIVE = 0x4000

/**
 * The rows of one table in PostgreSQL's binary COPY format, written into ~1 MB buffers that are
 * taken away as they fill (bulk-copy.ts sends them). Binary needs no escaping of the cells and no
 * parsing of text on the server side. Knows nothing of the connection: it runs in the import's
 * encoding thread (row-encoder-thread.ts).
 */
export class CopyEncoder {
  private buffer = Buffer.allocUnsafe(CHUNK_BYTES)
  // DataView writes are inlined by V8; Buffer's write methods check their arguments on every call.
  private view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.length)
  private at = 0
  private full: Buffer[] = []

  constructor() {
    this.room(SIGNATURE.length + 8)
    this.at += SIGNATURE.copy(this.buffer, this.at)
    this.view.setInt32(this.at, 0)
    this.view.setInt32(this.at + 4, 0)
    this.at += 8
  }

  /** Makes sure `bytes` more fit in the current buffer, setting the full one aside. */
  private room(bytes: number) {
    if (this.at + bytes <= this.buffer.length) return
    if (this.at) this.full.push(this.buffer.subarray(0, this.at))
    this.buffer = Buffer.allocUnsafe(Math.max(CHUNK_BYTES, bytes))
    this.view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.length)
    this.at = 0
  }

  /** Starts a row of `fields` values; each value then follows with one of the methods below. */
  row(fields: number) {
    this.room(2)
    this.view.setInt16(this.at, fields)
    this.at += 2
  }

  null() {
    this.room(4)
    this.view.setInt32(this.at, -1)
    this.at += 4
  }

  /** An int2, or NULL for null. */
  smallOrNull(value: number | null) {
    if (value === null) this.null()
    else this.int16(value)
  }

  /** Makes room for a value of `bytes` bytes after its length; returns where the value goes. */
  private field(bytes: number): number {
    this.room(4 + bytes)
    this.view.setInt32(this.at, bytes)
    const at = this.at + 4
    this.at = at + bytes
    return at
  }

  // `this.view` is read after field(), which may have moved to a new buffer.
  int16(value: number) {
    const at = this.field(2)
    this.view.setInt16(at, value)
  }

  int32(value: number) {
    const at = this.field(4)
    this.view.setInt32(at, value)
  }

  float4(value: number) {
    const at = this.field(4)
    this.view.setFloat32(at, value)
  }

  /** Bytes already in PostgreSQL's binary form of the column's type (a uuid). */
  raw(bytes: Buffer) {
    const at = this.field(bytes.length)
    // A few bytes each time (a uuid): a loop beats a call into Buffer.copy.
    for (let i = 0; i < bytes.length; i++) this.buffer[at + i] = bytes[i]!
  }

  text(value: string) {
    this.room(4 + 3 * value.length)
    this.at = this.putText(value, this.at)
  }

  /** A one-dimensional text[] without NULLs, of `count` values from `from` on. */
  textArray(values: readonly string[], from: number, count: number) {
    let bytes = 24
    for (let i = from; i < from + count; i++) bytes += 4 + 3 * values[i]!.length
    this.room(bytes)
    const start = this.at
    let at = this.arrayHead(start + 4, TEXT_OID, count, false)
    for (let i = from; i < from + count; i++) at = this.putText(values[i]!, at)
    this.view.setInt32(start, at - start - 4)
    this.at = at
  }

  /** A one-dimensional int4[] without NULLs. */
  int32Array(values: Int32Array) {
    this.arrayHeader(INT4_OID, values.length, 8 * values.length, false)
    for (const value of values) this.putInt32(value)
  }

  /** An int4[] whose 0 entries are NULL (a row's group codes: text columns get codes from 1, number columns none). */
  codes(values: Int32Array) {
    const nulls = values.includes(0)
    let elementBytes = 0
    for (const value of values) elementBytes += value === 0 ? 4 : 8
    this.arrayHeader(INT4_OID, values.length, elementBytes, nulls)
    for (const value of values) {
      if (value !== 0) this.putInt32(value)
      else {
        this.view.setInt32(this.at, -1)
        this.at += 4
      }
    }
  }

  /** A one-dimensional float8[] without NULLs. */
  float8Array(values: Float64Array) {
    this.arrayHeader(FLOAT8_OID, values.length, 12 * values.length, false)
    for (const value of values) {
      this.view.setInt32(this.at, 8)
      this.view.setFloat64(this.at + 4, value)
      this.at += 12
    }
  }

  private putInt32(value: number) {
    this.view.setInt32(this.at, 4)
    this.view.setInt32(this.at + 4, value)
    this.at += 8
  }

  private arrayHeader(oid: number, length: number, elementBytes: number, nulls: boolean) {
    this.room(24 + elementBytes)
    this.view.setInt32(this.at, 20 + elementBytes)
    this.at = this.arrayHead(this.at + 4, oid, length, nulls)
  }

  /** Dimensions, NULL flag and element type of a one-dimensional array starting at `at`. */
  private arrayHead(at: number, oid: number, length: number, nulls: boolean): number {
    this.view.setInt32(at, 1)
    this.view.setInt32(at + 4, nulls ? 1 : 0)
    this.view.setInt32(at + 8, oid)
    this.view.setInt32(at + 12, length)
    this.view.setInt32(at + 16, 1)
    return at + 20
  }

  /** An exact NUMERIC from a read number's significant digits, in base-10000 groups as PostgreSQL keeps it. */
  numeric(read: ReadNumber) {
    if (read.status === 'zero') {
      this.room(12)
      this.view.setInt32(this.at, 8)
      this.buffer.fill(0, this.at + 4, this.at + 12)
      this.at += 12
      return
    }
    const { digits, exponent } = read
    const lastExponent = exponent - digits.length + 1
    const weight = Math.floor(exponent / 4)
    const lastGroup = Math.floor(lastExponent / 4)
    const groups = weight - lastGroup + 1
    this.room(12 + 2 * groups)
    const view = this.view
    let at = this.at
    view.setInt32(at, 8 + 2 * groups)
    view.setInt16(at + 4, groups)
    view.setInt16(at + 6, weight)
    view.setUint16(at + 8, read.negative ? NUMERIC_NEGATIVE : 0)
    view.setInt16(at + 10, Math.max(0, -lastExponent))
    at += 12
    for (let group = weight; group >= lastGroup; group--) {
      let value = 0
      for (let place = 3; place >= 0; place--) {
        const index = exponent - (4 * group + place)
        value = value * 10 + (index >= 0 && index < digits.length ? digits.charCodeAt(index) - 48 : 0)
      }
      view.setInt16(at, value)
      at += 2
    }
    this.at = at
  }

  /** Writes a length-prefixed UTF-8 text at `at` (room already made); NUL cannot be stored in text and is dropped. */
  private putText(value: string, at: number): number {
    // Most cells are short ASCII: copying their characters here is several times faster than a
    // call into the UTF-8 encoder per cell. Anything else (and NUL, which is dropped) goes there.
    const buffer = this.buffer
    const length = value.length
    let i = 0
    while (i < length) {
      const code = value.charCodeAt(i)
      if (code === 0 || code > 127) break
      buffer[at + 4 + i++] = code
    }
    if (i === length) {
      this.view.setInt32(at, length)
      return at + 4 + length
    }
    const text = value.includes('\0') ? value.replaceAll('\0', '') : value
    const bytes = buffer.write(text, at + 4, 'utf8')
    this.view.setInt32(at, bytes)
    return at + 4 + bytes
  }

  /** The bytes written since the last take. Each buffer is the encoder's no more: it may be transferred. */
  take(): Buffer[] {
    if (this.at) {
      this.full.push(this.buffer.subarray(0, this.at))
      this.buffer = Buffer.allocUnsafe(CHUNK_BYTES)
      this.view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.length)
      this.at = 0
    }
    const taken = this.full
    this.full = []
    return taken
  }

  /** Ends the table's rows and takes the last bytes. */
  end(): Buffer[] {
    this.room(2)
    this.view.setInt16(this.at, -1)
    this.at += 2
    return this.take()
  }
}

/** A uuid's 16 bytes, written once per import and reused for every row. */
export function uuidBytes(id: string): Buffer {
  return Buffer.from(id.replaceAll('-', ''), 'hex')
}

// The rows and digit records leave out dataset_id: their import tables give it as the column's
// default (import.ts), which costs PostgreSQL less than reading 16 bytes per row.
export const ROW_COLUMNS = ['row_no', 'cells']
export const DIGIT_COLUMNS = [
  'column_pos', 'row_no', 'status', 'sign', 'value', 'first_digit', 'second_digit', 'first_two',
  'first_three', 'last_two', 'integer_digits', 'trailing_zeros', 'fraction_digits', 'mantissa', 'group_codes',
]
export const GROUP_VALUE_COLUMNS = ['dataset_id', 'column_pos', 'code', 'value', 'day']

/** A row's `width` cells start at `from` in `cells`. */
export function writeRow(out: CopyEncoder, rowNo: number, cells: readonly string[], from: number, width: number) {
  out.row(2)
  out.int32(rowNo)
  out.textArray(cells, from, width)
}

/** `codes` are the row's group codes (GroupCodes.codesOf). */
export function writeDigits(out: CopyEncoder, columnPos: number, rowNo: number, read: ReadNumber, r: DigitRecord, codes: Int32Array) {
  out.row(15)
  out.int16(columnPos)
  out.int32(rowNo)
  out.int16(STATUS_CODES[r.status])
  out.int16(r.sign)
  if (r.value === null) out.null()
  else out.numeric(read)
  out.smallOrNull(r.firstDigit)
  out.smallOrNull(r.secondDigit)
  out.smallOrNull(r.firstTwo)
  out.smallOrNull(r.firstThree)
  out.smallOrNull(r.lastTwo)
  out.int16(r.integerDigits)
  out.int16(r.trailingZeros)
  out.int16(r.fractionDigits)
  if (r.mantissa === null) out.null()
  else out.float4(r.mantissa)
  out.codes(codes)
}

/** `day`: the date the text names (days since 1970-01-01), null when it is no date or its column holds none. */
export function writeGroupValue(out: CopyEncoder, dataset: Buffer, columnPos: number, code: number, value: string, day: number | null) {
  out.row(5)
  out.raw(dataset)
  out.int16(columnPos)
  out.int32(code)
  out.text(value)
  if (day === null) out.null()
  else out.int32(day)
}
