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
/**
 * A typed array over shared memory: the counting thread (column-count-thread.ts) reads the records
 * where they are, without a copy.
 */
export function sharedArray<T>(Kind: { new (buffer: SharedArrayBuffer): T, BYTES_PER_ELEMENT: number }, length: number): T {
  return new Kind(new SharedArrayBuffer(length * Kind.BYTES_PER_ELEMENT))
}
