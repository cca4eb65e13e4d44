import { Readable } from 'node:stream'
import type { PoolClient } from 'pg'
import { describe, expect, it } from 'vitest'
import { CopyEncoder } from '../../server/services/datasets/copy-encoder'
import { NO_KEY } from '../../server/services/datasets/column-layout'
import { readColumnRecords } from '../../server/services/datasets/column-records'

// The column scan reads a column's digit records in PostgreSQL's binary COPY format (the tuple layout
// of the PostgreSQL 15 manual, "COPY", section "Binary Format"): a field count, then per field its
// length (-1 for NULL) and bytes. The COPY stream arrives in chunks that cut tuples anywhere.

interface Source {
  status: number
  sign: number
  value: number | null
  keys: (number | null)[]
  firstThree: number | null
  integerDigits: number
  trailingZeros: number
  fractionDigits: number
  mantissa: number | null
  codes: number[]
}

function float8(value: number) {
  const bytes = Buffer.alloc(8)
  bytes.writeDoubleBE(value)
  return bytes
}

/** The bytes PostgreSQL would send for the records, cut into pieces of 1 to `most` bytes. */
function copyBytes(records: Source[], most: number, seed = 7): Readable {
  const out = new CopyEncoder()
  for (const r of records) {
    out.row(12 + r.codes.length)
    out.int16(r.status)
    out.int16(r.sign)
    if (r.value === null) out.null()
    else out.raw(float8(r.value))
    for (const key of r.keys) out.smallOrNull(key)
    out.smallOrNull(r.firstThree)
    out.int16(r.integerDigits)
    out.int16(r.trailingZeros)
    out.int16(r.fractionDigits)
    if (r.mantissa === null) out.null()
    else out.float4(r.mantissa)
    for (const code of r.codes) out.int32(code)
  }
  const whole = Buffer.concat(out.end())
  const pieces: Buffer[] = []
  let state = seed
  for (let at = 0; at < whole.length;) {
    state = (state * 48271) % 2147483647
    const size = 1 + (state % most)
    pieces.push(whole.subarray(at, at + size))
    at += size
  }
  return Readable.from(pieces)
}

const fakeClient = (stream: Readable) => ({ query: () => stream }) as unknown as PoolClient

function ledger(count: number): Source[] {
  return Array.from({ length: count }, (_, i) => {
    if (i % 17 === 0) return { status: 0, sign: 0, value: null, keys: [null, null, null, null], firstThree: null, integerDigits: 0, trailingZeros: 0, fractionDigits: 0, mantissa: null, codes: [-1, i % 3] }
    const cents = 1000 + ((i * 7919) % 9_000_000)
    const sign = i % 5 === 0 ? -1 : 1
    const text = (cents / 100).toFixed(2)
    const integer = text.split('.')[0]!
    return {
      status: 3, sign, value: sign * Number(text),
      keys: [Number(integer[0]), Number(integer[1] ?? 0), integer.length > 1 ? Number(integer.slice(0, 2)) : null, integer.length > 1 ? Number(integer.slice(-2)) : null],
      firstThree: integer.length > 2 ? Number(integer.slice(0, 3)) : null,
      integerDigits: integer.length, trailingZeros: 0, fractionDigits: text.endsWith('0') ? 1 : 2,
      mantissa: Math.fround(Math.log10(Number(text)) % 1), codes: [1 + (i % 200), 1 + (i % 9)],
    }
  })
}

describe('a column\'s digit records read into memory from binary COPY', () => {
  for (const most of [1, 7, 64, 70_000]) {
    it(`reads every field of every record when the stream comes in pieces of up to ${most} bytes`, async () => {
      const source = ledger(2_000)
      const records = (await readColumnRecords(fakeClient(copyBytes(source, most)), '00000000-0000-0000-0000-000000000000', 4, [1, 3], 100))!
      expect(records.count).toBe(source.length)
      source.forEach((r, i) => {
        expect(records.status[i]).toBe(r.status)
        expect(records.sign[i]).toBe(r.sign)
        if (r.value === null) expect(records.value[i]).toBeNaN()
        else expect(records.value[i]).toBe(r.value)
        expect([0, 1, 2, 3].map(k => records.keys[i * 4 + k])).toEqual(r.keys.map(k => k ?? NO_KEY))
        expect(records.firstThree[i]).toBe(r.firstThree ?? 0)
        expect([records.integerDigits[i], records.trailingZeros[i], records.fractionDigits[i]]).toEqual([r.integerDigits, r.trailingZeros, r.fractionDigits])
        if (r.mantissa === null) expect(records.cos[i]).toBeNaN()
        else {
          // cos and sin of the float4 mantissa as sent, each kept as float4.
          expect(records.cos[i]).toBe(Math.fround(Math.cos(2 * Math.PI * r.mantissa)))
          expect(records.sin[i]).toBe(Math.fround(Math.sin(2 * Math.PI * r.mantissa)))
        }
        expect([records.codes.get(1)![i], records.codes.get(3)![i]]).toEqual(r.codes)
      })
      expect(records.largestCode.get(1)).toBe(200)
      expect(records.largestCode.get(3)).toBe(9)
    })
  }

  // A double holds every decimal of at most 15 significant digits apart from its neighbours
  // (IEEE 754 binary64: 53 bits, 15.95 decimal digits); beyond that, two values may share one.
  const inexact: Array<[string, Partial<Source>]> = [
    ['16 significant digits', { value: 1234567890.123456, integerDigits: 10, fractionDigits: 6 }],
    ['a value under 1e-6, whose shortest text needs an exponent', { value: 0.0000005, integerDigits: 0, fractionDigits: 7 }],
    ['a value of 1e21 or more', { value: 1e21, integerDigits: 22, fractionDigits: 0, trailingZeros: 21 }],
  ]
  for (const [label, change] of inexact) {
    it(`leaves a column with ${label} to SQL`, async () => {
      const source = ledger(50)
      source[20] = { ...source[20]!, ...change }
      expect(await readColumnRecords(fakeClient(copyBytes(source, 64)), '00000000-0000-0000-0000-000000000000', 4, [1, 3], 50)).toBeNull()
    })
  }
})
