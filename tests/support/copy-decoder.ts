// A reader of PostgreSQL's binary COPY format, written apart from the encoder from PostgreSQL's
// documentation ("COPY", section "Binary Format") and the send functions it names: int2/int4/float4/
// float8 in network byte order, text as UTF-8 bytes, arrays as array_send writes them (ndim,
// has-null flag, element type, then length and lower bound per dimension, then each element with
// its length), numeric as numeric_send does (ndigits, weight, sign, dscale, base-10000 digits).

const SIGNATURE = Buffer.from('PGCOPY\n\xff\r\n\0', 'latin1')

/** The rows of a COPY stream, each a list of its fields' bytes (null for SQL NULL). */
export function copyRows(bytes: Buffer): (Buffer | null)[][] {
  if (!bytes.subarray(0, SIGNATURE.length).equals(SIGNATURE)) throw new Error('not a binary COPY stream')
  let at = SIGNATURE.length + 4
  at += 4 + bytes.readInt32BE(SIGNATURE.length + 4)
  const rows: (Buffer | null)[][] = []
  for (;;) {
    const fields = bytes.readInt16BE(at)
    at += 2
    if (fields === -1) break
    const row: (Buffer | null)[] = []
    for (let i = 0; i < fields; i++) {
      const length = bytes.readInt32BE(at)
      at += 4
      if (length === -1) row.push(null)
      else {
        row.push(bytes.subarray(at, at + length))
        at += length
      }
    }
    rows.push(row)
  }
  if (at !== bytes.length) throw new Error(`${bytes.length - at} bytes after the trailer`)
  return rows
}

export const int2 = (field: Buffer | null) => field && field.readInt16BE(0)
export const int4 = (field: Buffer | null) => field && field.readInt32BE(0)
export const float4 = (field: Buffer | null) => field && field.readFloatBE(0)
export const text = (field: Buffer | null) => field && field.toString('utf8')

/** A one-dimensional array's elements, each read by `element`. */
export function array<T>(field: Buffer, element: (bytes: Buffer | null) => T): T[] {
  const dimensions = field.readInt32BE(0)
  if (dimensions === 0) return []
  if (dimensions !== 1) throw new Error(`${dimensions}-dimensional array`)
  const length = field.readInt32BE(12)
  let at = 20
  const out: T[] = []
  for (let i = 0; i < length; i++) {
    const size = field.readInt32BE(at)
    at += 4
    out.push(element(size === -1 ? null : field.subarray(at, at + size)))
    if (size > 0) at += size
  }
  return out
}

/** A numeric as plain decimal text ("-1234.5", "0.001"), from its base-10000 digits. */
export function numeric(field: Buffer | null): string | null {
  if (!field) return null
  const ndigits = field.readInt16BE(0)
  const weight = field.readInt16BE(2)
  const sign = field.readUInt16BE(4)
  const dscale = field.readInt16BE(6)
  if (sign === 0xC000) return 'NaN'
  const groups = Array.from({ length: ndigits }, (_, i) => field.readInt16BE(8 + 2 * i))
  // Group i is worth 10000^(weight - i): write every group as four decimal digits, then place the point.
  const integerGroups = Math.max(weight + 1, 0)
  let integer = ''
  for (let i = 0; i < integerGroups; i++) integer += String(groups[i] ?? 0).padStart(4, '0')
  let fraction = ''
  for (let i = integerGroups; i < ndigits; i++) fraction += String(groups[i]).padStart(4, '0')
  if (weight < -1) fraction = '0000'.repeat(-weight - 1) + fraction
  integer = integer.replace(/^0+(?=\d)/, '') || '0'
  fraction = fraction.padEnd(dscale, '0').slice(0, dscale)
  return `${sign === 0x4000 ? '-' : ''}${integer}${fraction ? `.${fraction}` : ''}`
}
