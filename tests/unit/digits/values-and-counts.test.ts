import { describe, expect, it } from 'vitest'
import { toDigitRecord, DISTRIBUTIONS, runDigitTest, thresholdBand } from '#shared/digits'
import type { TestInput, ColumnProfile, DigitRecord, DistributionTest, StatusCounts, TestName } from '#shared/digits'
import { jsonColumn } from './open-data'

/*
 * The server counts in PostgreSQL. These helpers play that part: each is a literal GROUP BY over
 * digit records, written here apart from the engine, following the SQL in shared/digits/types.ts.
 */

const column = (jsonColumn('movies.json', 'US DVD Sales') as Array<number | null>)
  .concat(jsonColumn('movies.json', 'Production Budget') as Array<number | null>)
  .map((x, i) => (x === null ? (i % 7 === 0 ? 'n/a' : '') : i % 5 === 0 ? `(${x})` : i % 3 === 0 ? `$${x.toLocaleString('en-US')}.00` : String(x)))
const records = column.map(cell => toDigitRecord(cell))

function groupBy<K>(rows: DigitRecord[], key: (row: DigitRecord) => K): Map<K, DigitRecord[]> {
  const groups = new Map<K, DigitRecord[]>()
  for (const row of rows) groups.set(key(row), [...(groups.get(key(row)) ?? []), row])
  return groups
}

function statusCounts(rows: DigitRecord[]): StatusCounts {
  const count = (status: string, sign: number) => rows.filter(r => r.status === status && (sign === 0 || r.sign === sign)).length
  return { blank: count('blank', 0), unreadable: count('unreadable', 0), zero: count('zero', 0), positive: count('number', 1), negative: count('number', -1) }
}

const signed = (sign: 1 | -1) => records.filter(r => r.status === 'number' && r.sign === sign)
const sumOf = (rows: DigitRecord[], f: (r: DigitRecord) => number) => rows.reduce((s, r) => s + f(r), 0)
const abs = (value: string) => value.replace('-', '')

/** SUM(abs(value)) on NUMERIC: exact, through BigInt cents (every value here has at most 2 places). */
function exactSum(values: string[]): string {
  const cents = values.reduce((s, v) => s + BigInt(Math.round(Number(abs(v)) * 100)), 0n)
  const text = cents.toString().padStart(3, '0')
  return `${text.slice(0, -2)}.${text.slice(-2)}`
}

function countsFor(test: TestName, sign: 1 | -1): TestInput<TestName> {
  const rows = signed(sign)
  const status = statusCounts(records)
  switch (test) {
    case 'summation':
      return { counts: { status, keys: [...groupBy(rows, r => r.firstTwo)].map(([key, g]) => ({ key, count: g.length, amount: exactSum(g.map(r => r.value!)) })) } }
    case 'duplicates': {
      const byValue = [...groupBy(rows, r => r.value!)]
      const repeated = byValue.filter(([, g]) => g.length > 1)
      return { counts: { status, distinct: byValue.length, repeated: { values: repeated.length, rows: sumOf(repeated.flatMap(([, g]) => g), () => 1) }, top: repeated.map(([value, g]) => ({ value, count: g.length })) } }
    }
    case 'round-numbers':
      return { counts: { status, cells: [...groupBy(rows, r => `${r.integerDigits} ${r.trailingZeros} ${r.fractionDigits}`).values()].map(g => ({ integerDigits: g[0]!.integerDigits, trailingZeros: g[0]!.trailingZeros, fractionDigits: g[0]!.fractionDigits, count: g.length })) } }
    case 'threshold': {
      // floor((abs(value) − low) / width) in exact cents: limit 1,000,000, width 50,000.
      const inBand = rows.filter(r => Number(abs(r.value!)) >= 750000 && Number(abs(r.value!)) < 1250000)
      return { counts: { status, buckets: [...groupBy(inBand, r => Math.floor((Number(abs(r.value!)) - 750000) / 50000))].map(([bucket, g]) => ({ bucket, count: g.length })) } }
    }
    default: {
      const field = DISTRIBUTIONS[test as DistributionTest].field
      const withKey = rows.filter(r => r[field] !== null)
      return {
        counts: {
          status,
          keys: [...groupBy(rows, r => r[field])].map(([key, g]) => ({ key, count: g.length })),
          arc: { cos: sumOf(withKey, r => Math.cos(2 * Math.PI * r.mantissa!)), sin: sumOf(withKey, r => Math.sin(2 * Math.PI * r.mantissa!)) },
        },
      }
    }
  }
}

function profileFor(sign: 1 | -1): ColumnProfile {
  const rows = signed(sign)
  const amounts = rows.map(r => Number(abs(r.value!)))
  const [min, max] = [Math.min(...amounts), Math.max(...amounts)]
  const largest = (groups: Map<unknown, DigitRecord[]>) => Math.max(...[...groups.values()].map(g => g.length))
  return {
    n: rows.length,
    min: String(min),
    max: String(max),
    atMin: amounts.filter(a => a === min).length,
    atMax: amounts.filter(a => a === max).length,
    whole: rows.filter(r => r.fractionDigits === 0).length,
    roundHundreds: rows.filter(r => r.fractionDigits === 0 && r.trailingZeros >= 2).length,
    commonLength: largest(groupBy(rows, r => r.integerDigits)),
    topValue: largest(groupBy(rows, r => r.value)),
  }
}

describe('values and the server\'s counts give the same result', () => {
  it('the column mixes signs, blanks, unreadable cells and formats', () => {
    const status = statusCounts(records)
    expect(status.positive).toBeGreaterThan(1000)
    expect(status.negative).toBeGreaterThan(100)
    expect(status.blank).toBeGreaterThan(0)
    expect(status.unreadable).toBeGreaterThan(0)
  })

  it.each(['first-digit', 'second-digit', 'first-two-digits', 'first-three-digits', 'last-two-digits', 'summation', 'duplicates', 'round-numbers', 'threshold'] as const)('%s', (test) => {
    for (const [sign, filter] of [[1, 'positive'], [-1, 'negative']] as const) {
      const options = { test, sign: filter, threshold: { limit: 1000000 }, column: 'amount' }
      const fromValues = runDigitTest({ ...options, input: { values: column } })
      const fromCounts = runDigitTest({ ...options, input: { ...countsFor(test, sign), profile: profileFor(sign) } as TestInput<TestName> })
      const { arc: arcFromValues, ...restFromValues } = fromValues
      const { arc: arcFromCounts, ...restFromCounts } = fromCounts
      expect(restFromCounts).toEqual(restFromValues)
      // The arc sums are floats added in another order; they agree to rounding.
      if (arcFromValues) expect(arcFromCounts!.l2).toBeCloseTo(arcFromValues.l2, 12)
      else expect(arcFromCounts).toBeNull()
      expect(fromValues.n).toBeGreaterThan(0)
    }
  })

  it('uses the threshold band the SQL above assumes', () => {
    const band = thresholdBand({ limit: 1000000 })
    expect([band.low, band.width, band.high].map(d => Number(d.units) / 10 ** d.scale)).toEqual([750000, 50000, 1250000])
  })

  it('refuses counts that do not add up to the values of the tested sign', () => {
    const input = countsFor('first-digit', 1) as { counts: { status: StatusCounts } }
    const broken = { counts: { ...input.counts, status: { ...input.counts.status, positive: input.counts.status.positive + 1 } } }
    expect(() => runDigitTest({ test: 'first-digit', input: broken as TestInput<'first-digit'> })).toThrow(RangeError)
  })

  it('reports every excluded value by its reason', () => {
    const positive = runDigitTest({ test: 'first-two-digits', input: { values: column } })
    const negative = runDigitTest({ test: 'first-two-digits', sign: 'negative', input: { values: column } })
    const status = statusCounts(records)
    expect(positive.excluded).toMatchObject({ blank: status.blank, unreadable: status.unreadable, zero: status.zero, negative: status.negative, positive: 0 })
    expect(negative.excluded).toMatchObject({ negative: 0, positive: status.positive })
    const below = signed(1).filter(r => r.firstTwo === null).length
    expect(positive.excluded.belowMinimum).toBe(below)
    expect(positive.n + below).toBe(status.positive)
  })
})
