import { describe, expect, it } from 'vitest'
import { DISTRIBUTIONS, DOT_STYLE, countDistribution, profileOf, recordsOf } from '#shared/digits'
import type { DigitRecord, DistributionCounts, DistributionTest, SignFilter } from '#shared/digits'
import { countRecords, countsOfTally, tallyBuffers, tallyRecords } from '../../server/services/datasets/column-count'
import type { CountSpec } from '../../server/services/datasets/column-count'
import { NO_KEY, largest } from '../../server/services/datasets/column-layout'
import type { ColumnRecords } from '../../server/services/datasets/column-layout'
import { bucketValues } from '../../server/services/datasets/value-buckets'
import { ledger } from '../fixtures/datasets/ledger'
import type { LedgerEntry } from '../fixtures/datasets/ledger'

// The column scan's counts over records in memory (server/services/datasets/column-count.ts) against the
// engine's own counting of the same cells (shared/digits/count-records.ts, the path every test on
// values takes), for the records the fixture itself says each filter keeps.
const ENTRIES = ledger()
const RECORDS = recordsOf(ENTRIES.map(e => e.amount), DOT_STYLE)
const STATUS = { blank: 0, unreadable: 1, zero: 2, number: 3 } as const

/** Codes by first appearance (1, 2, …), as an import's dictionary gives them. */
function codesOf(values: string[]) {
  const dictionary = new Map<string, number>()
  const codes = Int32Array.from(values, v => dictionary.get(v) ?? dictionary.set(v, dictionary.size + 1).get(v)!)
  return { codes, dictionary }
}
const VENDOR = codesOf(ENTRIES.map(e => e.vendor))
const DEPARTMENT = codesOf(ENTRIES.map(e => e.department))
const [VENDOR_POS, DEPARTMENT_POS] = [0, 1]

/** The records as PostgreSQL holds them (digit_records), in the arrays the column scan reads. */
function inMemory(records: DigitRecord[]): ColumnRecords {
  const n = records.length
  const key = (k: number | null) => k ?? NO_KEY
  const held: ColumnRecords = {
    count: n, status: new Uint8Array(n), sign: new Int8Array(n), value: new Float64Array(n), keys: new Uint8Array(4 * n),
    firstThree: new Uint16Array(n), integerDigits: new Uint8Array(n), trailingZeros: new Uint8Array(n), fractionDigits: new Uint8Array(n),
    cos: new Float32Array(n), sin: new Float32Array(n), buckets: bucketValues(new Float64Array(0), 0), codes: new Map([[VENDOR_POS, VENDOR.codes], [DEPARTMENT_POS, DEPARTMENT.codes]]),
    largestCode: new Map([[VENDOR_POS, largest(VENDOR.codes)], [DEPARTMENT_POS, largest(DEPARTMENT.codes)]]), bytes: 0,
  }
  records.forEach((r, i) => {
    held.status[i] = STATUS[r.status]
    held.sign[i] = r.sign
    held.value[i] = r.value === null ? Number.NaN : Number(r.value)
    held.keys.set([key(r.firstDigit), key(r.secondDigit), key(r.firstTwo), key(r.lastTwo)], 4 * i)
    held.firstThree[i] = r.firstThree ?? 0
    held.integerDigits[i] = r.integerDigits
    held.trailingZeros[i] = r.trailingZeros
    held.fractionDigits[i] = r.fractionDigits
    // As the column's read works them out: of the mantissa PostgreSQL keeps (float4), each kept as float4.
    const angle = r.mantissa === null ? Number.NaN : 2 * Math.PI * Math.fround(r.mantissa)
    held.cos[i] = Math.cos(angle)
    held.sin[i] = Math.sin(angle)
  })
  held.buckets = bucketValues(held.value, n)
  return held
}
const HELD = inMemory(RECORDS)

/** An amount's signed cents from the fixture's own meaning, null for blank and unreadable cells. */
const cents = (e: LedgerEntry) => (e.meaning.kind === 'number' ? e.meaning.sign * e.meaning.cents : e.meaning.kind === 'zero' ? 0 : null)

/** A stored amount, so that `below` falls exactly on a value the column holds (which it must leave out). */
const FIRST_FROM_5000 = Math.min(...ENTRIES.flatMap(e => (e.meaning.kind === 'number' && e.meaning.sign > 0 && e.meaning.cents >= 500_000 ? [e.meaning.cents] : [])))

interface Case {
  label: string
  spec: Omit<CountSpec, 'test' | 'sign'>
  keep: (e: LedgerEntry) => boolean
  byVendor?: true
}
const code = (dictionary: Map<string, number>, ...values: string[]) => values.map(v => dictionary.get(v)!)
const CASES: Case[] = [
  { label: 'every record', spec: { filters: [], range: null, groupBy: null }, keep: () => true },
  {
    label: 'department one of two, amount at least 100, by vendor',
    spec: { filters: [{ position: DEPARTMENT_POS, codes: code(DEPARTMENT.dictionary, 'Roads', 'Parks'), negate: false }], range: { min: 100 }, groupBy: VENDOR_POS },
    keep: e => ['Roads', 'Parks'].includes(e.department) && (cents(e) ?? -Infinity) >= 10_000, byVendor: true,
  },
  {
    label: 'vendor not one of two, department Libraries, amount from -2,000 to 12,000',
    spec: {
      filters: [{ position: VENDOR_POS, codes: code(VENDOR.dictionary, 'Alderbank Works', 'Corvid Haulage'), negate: true }, { position: DEPARTMENT_POS, codes: code(DEPARTMENT.dictionary, 'Libraries'), negate: false }],
      range: { min: -2000, max: 12000 }, groupBy: null,
    },
    keep: (e) => {
      const c = cents(e)
      return !['Alderbank Works', 'Corvid Haulage'].includes(e.vendor) && e.department === 'Libraries' && c !== null && c >= -200_000 && c <= 1_200_000
    },
  },
  {
    // The value ladder counts the part of a rung a range cuts through as [min, the rung's bound).
    label: 'amount from 100 to under the first positive amount of 5,000 or more',
    spec: { filters: [], range: { min: 100, below: FIRST_FROM_5000 / 100 }, groupBy: null },
    keep: e => cents(e) !== null && cents(e)! >= 10_000 && cents(e)! < FIRST_FROM_5000,
  },
  {
    // Narrow ranges read only the value buckets they touch (value-buckets.ts).
    label: 'amount from 250 to 300, by vendor',
    spec: { filters: [], range: { min: 250, max: 300 }, groupBy: VENDOR_POS },
    keep: e => cents(e) !== null && cents(e)! >= 25_000 && cents(e)! <= 30_000, byVendor: true,
  },
  {
    label: 'amount exactly the first positive amount of 5,000 or more (its ties too)',
    spec: { filters: [], range: { min: FIRST_FROM_5000 / 100, max: FIRST_FROM_5000 / 100 }, groupBy: null },
    keep: e => cents(e) === FIRST_FROM_5000,
  },
  {
    label: 'amount from -500 to under 0',
    spec: { filters: [], range: { min: -500, below: 0 }, groupBy: null },
    keep: e => cents(e) !== null && cents(e)! >= -50_000 && cents(e)! < 0,
  },
  {
    label: 'amount at most 99.995 (between two cents), by vendor',
    spec: { filters: [], range: { max: 99.995 }, groupBy: VENDOR_POS },
    keep: e => cents(e) !== null && cents(e)! <= 9999, byVendor: true,
  },
]

/**
 * The engine's counts with key order and the null key as they come, compared as maps. Both add cos
 * and sin of the same float4 mantissas, in the same order; memory keeps each term as float4, within
 * 2^-25 of the double, so the sums of n terms agree within n·2^-25 (and exactly in their counts).
 * The arc is counted only for the tests that read it.
 */
function same(test: DistributionTest, actual: DistributionCounts, expected: DistributionCounts, label: string) {
  expect(actual.status, label).toEqual(expected.status)
  const asMap = (c: DistributionCounts) => new Map(c.keys.filter(k => k.count).map(k => [k.key, k.count]))
  expect(asMap(actual), label).toEqual(asMap(expected))
  if (!DISTRIBUTIONS[test].arc) {
    expect(actual.arc, label).toBeUndefined()
    return
  }
  const bound = (actual.status.positive + actual.status.negative) * 2 ** -25 + 1e-12
  expect(Math.abs(actual.arc!.cos - expected.arc!.cos), label).toBeLessThanOrEqual(bound)
  expect(Math.abs(actual.arc!.sin - expected.arc!.sin), label).toBeLessThanOrEqual(bound)
}

describe('counts over a column\'s records in memory equal the engine\'s counts of the same cells', () => {
  for (const c of CASES) {
    for (const test of Object.keys(DISTRIBUTIONS) as DistributionTest[]) {
      for (const sign of ['positive', 'negative'] as SignFilter[]) {
        it(`${test}, ${sign}, ${c.label}`, () => {
          const kept = ENTRIES.flatMap((e, i) => (c.keep(e) ? [i] : []))
          expect(kept.length).toBeGreaterThan(0)
          const counted = countRecords(HELD, { ...c.spec, test, sign })!
          const records = kept.map(i => RECORDS[i]!)
          // The arc of a record is summed from its mantissa as PostgreSQL keeps it (float4).
          const asStored = records.map(r => ({ ...r, mantissa: r.mantissa === null ? null : Math.fround(r.mantissa) }))
          const byCode = new Map(counted.cells.map(cell => [cell.code, cell.counts]))
          if (c.byVendor) {
            for (const [vendor, vendorCode] of VENDOR.dictionary) {
              const mine = asStored.filter((_, j) => ENTRIES[kept[j]!]!.vendor === vendor)
              if (!mine.length) expect(byCode.has(vendorCode)).toBe(false)
              else same(test, byCode.get(vendorCode)!, countDistribution(test, mine, sign), `${vendor}`)
            }
          }
          else same(test, byCode.get(-1)!, countDistribution(test, asStored, sign), 'whole')
          const { topValue: _, ...profile } = profileOf(records, sign)
          if (profile.n) expect(counted.profile).toEqual(profile)
          else expect(counted.profile).toBeNull()
        })
      }
    }
  }
})

describe('a count sent back from the counting thread', () => {
  it('moves its arrays between threads (no shared memory among them) and makes the same cells', () => {
    for (const c of CASES) {
      const spec = { ...c.spec, test: 'first-digit' as DistributionTest, sign: 'positive' as SignFilter }
      const tally = tallyRecords(HELD, spec)!
      // As postMessage does it (column-count-thread.ts): a shared buffer in the list would throw here.
      const moved = structuredClone(tally, { transfer: tallyBuffers(tally) })
      expect(tally.status.length, c.label).toBe(0)
      const sent = countsOfTally(moved, spec)
      const here = countRecords(HELD, spec)!
      expect(sent.cells, c.label).toEqual(here.cells)
      expect(sent.profile, c.label).toEqual(here.profile)
      expect([...sent.lengths], c.label).toEqual([...here.lengths])
    }
  })
})
