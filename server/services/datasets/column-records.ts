import type { PoolClient } from 'pg'
import { to as copyTo } from 'pg-copy-streams'
import { STATUS_CODES } from './digit-columns'
import { NO_KEY, largest, sharedArray } from './column-layout'
import type { ColumnRecords } from './column-layout'
import { bucketValues } from './value-buckets'
import type { ValueBuckets } from './value-buckets'

/** Before the read ends, a column has no buckets yet. */
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
      count: 0, status: sharedArray(Uint8Array, capacity), sign: sharedArray(Int8Array, capacity), value: sharedArray(Float64Array, capacity),
      keys: sharedArray(Uint8Array, capacity * 4), firstThree: sharedArray(Uint16Array, capacity), integerDigits: sharedArray(Uint8Array, capacity),
      trailingZeros: sharedArray(Uint8Array, capacity), fractionDigits: sharedArray(Uint8Array, capacity), cos: sharedArray(Float32Array, capacity), sin: sharedArray(Float32Array, capacity),
      buckets: NO_BUCKETS, codes: new Map(textPositions.map(p => [p, sharedArray(Int32Array, capacity)])), largestCode: new Map(), bytes: 0,
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
