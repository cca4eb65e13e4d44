import type { PoolClient } from 'pg'
import { to as copyTo } from 'pg-copy-streams'
import { STATUS_CODES } from './digit-columns'
import { bucketValues } from './value-buckets'
import type { ValueBuckets } from './value-buckets'

/**
 * One number column's digit records read once from PostgreSQL into typed arrays, one per field, so
 * that a question no cell of the import holds is counted in memory (column-scan.ts) instead of by a
 * scan of a table of 130-byte rows. The records stay in PostgreSQL; this is a copy to read.
 *
 * A column is only read this way when doubles hold its values exactly enough: every value has at most
 * 15 significant digits (distinct decimals are then distinct doubles, in the same order, so ranges,
 * ties and ends agree with PostgreSQL's NUMERIC) and lies between 1e-6 and 1e21 (its shortest double
 * text is then its plain decimal text). Any other column answers `null` and is counted by SQL.
 */
export interface ColumnRecords {
  count: number
  /** digit_records.status and .sign. */
  status: Uint8Array
  sign: Int8Array
  /** The signed value (0 for zero, NaN for blank and unreadable cells). */
  value: Float64Array
  /** first digit, second digit, first two, last two (NO_KEY: none), four per record. */
  keys: Uint8Array
  /** first three digits (0: none). */
  firstThree: Uint16Array
  integerDigits: Uint8Array
  trailingZeros: Uint8Array
  fractionDigits: Uint8Array
  /**
   * cos and sin of 2π·mantissa, the mantissa as PostgreSQL stores it (real), worked out once at the
   * read (they were most of a question's time); NaN for none. Kept as float32, each within 2^-25 of
   * the double: a sum over n records then differs from SQL's by at most n·2^-25.
   */
  cos: Float32Array
  sin: Float32Array
  /** The records by value, coarsely (value-buckets.ts), for narrow ranges. */
  buckets: ValueBuckets
  /** Per coded text or date column position, each record's group code (-1: none stored). */
  codes: Map<number, Int32Array>
  /** Per coded column, its largest code. */
  largestCode: Map<number, number>
  bytes: number
}

/** The largest of some codes, 0 for none (a spread of many would overflow the stack). */
export function largest(codes: ArrayLike<number>): number {
  let max = 0
  for (let i = 0; i < codes.length; i++) if (codes[i]! > max) max = codes[i]!
  return max
}

export const NO_KEY = 255
const NO_BUCKETS: ValueBuckets = { bounds: new Float64Array(0), starts: new Uint32Array(2), order: new Uint32Array(0) }
const MAX_DIGITS = 15

const SELECT = (datasetId: string, columnPos: number, textPositions: number[]) => `COPY (SELECT status, sign, value::float8,
    first_digit, second_digit, first_two, last_two, first_three, integer_digits, trailing_zeros, fraction_digits, mantissa
    ${textPositions.map(p => `, coalesce(group_codes[${Math.trunc(p) + 1}], -1)`).join('')}
  FROM digit_records WHERE dataset_id = '${datasetId.replace(/[^0-9a-f-]/gi, '')}' AND column_pos = ${Math.trunc(columnPos)}) TO STDOUT WITH (FORMAT binary)`

class Growing {
  constructor(public records: ColumnRecords, private readonly textPositions: number[]) {}

  static of(capacity: number, textPositions: number[]) {
    const records: ColumnRecords = {
      count: 0, status: new Uint8Array(capacity), sign: new Int8Array(capacity), value: new Float64Array(capacity),
      keys: new Uint8Array(capacity * 4), firstThree: new Uint16Array(capacity), integerDigits: new Uint8Array(capacity),
      trailingZeros: new Uint8Array(capacity), fractionDigits: new Uint8Array(capacity), cos: new Float32Array(capacity), sin: new Float32Array(capacity),
      buckets: NO_BUCKETS, codes: new Map(textPositions.map(p => [p, new Int32Array(capacity)])), largestCode: new Map(), bytes: 0,
    }
    return new Growing(records, textPositions)
  }

  /** Room for one more record: the arrays double when full. */
  room() {
    const r = this.records
    if (r.count < r.status.length) return
    const bigger = Growing.of(Math.max(1024, r.status.length * 2), this.textPositions).records
    for (const key of ['status', 'sign', 'value', 'keys', 'firstThree', 'integerDigits', 'trailingZeros', 'fractionDigits', 'cos', 'sin'] as const) {
      (bigger[key] as Uint8Array).set(r[key] as Uint8Array)
    }
    for (const [p, codes] of r.codes) bigger.codes.get(p)!.set(codes)
    bigger.count = r.count
    this.records = bigger
  }
}

/** A field's bytes in a binary COPY tuple: its length (-1: NULL) and where it starts. */
function readTuple(buffer: Buffer, at: number, fields: Int32Array, starts: Int32Array): number {
  const count = buffer.readInt16BE(at)
  let p = at + 2
  for (let f = 0; f < count; f++) {
    if (p + 4 > buffer.length) return -1
    const length = buffer.readInt32BE(p)
    p += 4
    fields[f] = length
    starts[f] = p
    if (length > 0) {
      if (p + length > buffer.length) return -1
      p += length
    }
  }
  return p
}

/**
 * Reads a column's records over `client`, in binary COPY (about 60 bytes a record on the wire).
 * Null when the column's values are not held exactly by doubles (see ColumnRecords).
 */
export async function readColumnRecords(client: PoolClient, datasetId: string, columnPos: number, textPositions: number[], expected: number): Promise<ColumnRecords | null> {
  const growing = Growing.of(Math.max(1, expected), textPositions)
  const width = 12 + textPositions.length
  const fields = new Int32Array(width)
  const starts = new Int32Array(width)
  const stream = client.query(copyTo(SELECT(datasetId, columnPos, textPositions)))
  let carry: Buffer = Buffer.alloc(0)
  let header = true
  let exact = true
  const small = (b: Buffer, f: number, none: number) => (fields[f]! < 0 ? none : b.readInt16BE(starts[f]!))
  for await (const chunk of stream as AsyncIterable<Buffer>) {
    const buffer = carry.length ? Buffer.concat([carry, chunk]) : chunk
    let at = 0
    if (header) {
      if (buffer.length < 19) {
        carry = buffer
        continue
      }
      at = 19 + buffer.readInt32BE(15)
      header = false
    }
    while (at + 2 <= buffer.length) {
      if (buffer.readInt16BE(at) === -1) {
        at = buffer.length
        break
      }
      const next = readTuple(buffer, at, fields, starts)
      if (next < 0) break
      growing.room()
      const r = growing.records
      const i = r.count++
      const status = buffer.readInt16BE(starts[0]!)
      r.status[i] = status
      r.sign[i] = buffer.readInt16BE(starts[1]!)
      const value = fields[2]! < 0 ? Number.NaN : buffer.readDoubleBE(starts[2]!)
      r.value[i] = value
      for (let k = 0; k < 4; k++) r.keys[i * 4 + k] = small(buffer, 3 + k, NO_KEY)
      r.firstThree[i] = small(buffer, 7, 0)
      const integerDigits = buffer.readInt16BE(starts[8]!)
      const fractionDigits = buffer.readInt16BE(starts[10]!)
      r.integerDigits[i] = Math.min(integerDigits, 255)
      r.trailingZeros[i] = Math.min(buffer.readInt16BE(starts[9]!), 255)
      r.fractionDigits[i] = Math.min(fractionDigits, 255)
      const angle = fields[11]! < 0 ? Number.NaN : 2 * Math.PI * buffer.readFloatBE(starts[11]!)
      r.cos[i] = Math.cos(angle)
      r.sin[i] = Math.sin(angle)
      textPositions.forEach((p, t) => (r.codes.get(p)![i] = buffer.readInt32BE(starts[12 + t]!)))
      if (status === STATUS_CODES.number) {
        const abs = Math.abs(value)
        if ((integerDigits > 0 ? integerDigits + fractionDigits : fractionDigits) > MAX_DIGITS || abs < 1e-6 || abs >= 1e21) exact = false
      }
      at = next
    }
    carry = buffer.subarray(at)
  }
  if (!exact) return null
  const r = growing.records
  for (const [p, codes] of r.codes) r.largestCode.set(p, largest(codes.subarray(0, r.count)))
  r.buckets = bucketValues(r.value, r.count)
  r.bytes = r.status.length * (1 + 1 + 8 + 4 + 2 + 3 + 8 + 4 * textPositions.length) + r.buckets.order.byteLength
  return r
}
