import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import { toDecimal, runDigitTest, thresholdBand, thresholdBucket } from '#shared/digits'
import { jsonColumn } from './open-data'

/** x = 10^(1 + 3i/count) to the cent: log-uniform over three decades, so every first-two bucket holds about 1/90 of the sum. */
function logUniformAmounts(count: number): string[] {
  return Array.from({ length: count }, (_, i) => (10 ** (1 + (3 * i) / count)).toFixed(2))
}

describe('summation', () => {
  it('finds flat amounts in log-uniform data and a spike where one amount is repeated', () => {
    const smooth = runDigitTest({ test: 'summation', input: { values: logUniformAmounts(20000) } })
    expect(smooth.mad!.value).toBeLessThan(0.0005)
    expect(smooth.mad!.conformity).toBeNull() // no published ranges for this test
    const planted = runDigitTest({ test: 'summation', input: { values: [...logUniformAmounts(20000), ...Array.from({ length: 100 }, () => '5000.00')] } })
    const top = [...planted.bins].sort((a, b) => b.share - a.share)[0]!
    expect(top.key).toBe('50')
    expect(top.share).toBeGreaterThan(2 / 90)
    expect(planted.mad!.value).toBeGreaterThan(smooth.mad!.value)
  })

  it('sums amounts exactly and expects 1/90 of the total per bucket (docs/check-values.md)', () => {
    const values = ['0.10', '0.20', '12.10', '12.20', '12.30', '-12.40', '99.99', '1e20', '5']
    const result = runDigitTest({ test: 'summation', input: { values } })
    const bin = (key: string) => result.bins.find(b => b.key === key)!
    // Exact: 12.10 + 12.20 + 12.30 = 36.6 (a float sum gives 36.599999999999994).
    expect(12.1 + 12.2 + 12.3).not.toBe(36.6)
    expect(bin('12')).toMatchObject({ count: 3, amount: '36.6', expectedShare: 1 / 90, expected: null, z: null })
    expect(bin('10')).toMatchObject({ count: 1, amount: `1${'0'.repeat(20)}` })
    expect(result.excluded).toMatchObject({ belowMinimum: 3, negative: 1 })
    expect(result.bins.reduce((s, b) => s + b.share, 0)).toBeCloseTo(1, 12)
    const negatives = runDigitTest({ test: 'summation', sign: 'negative', input: { values } })
    expect(negatives.bins.find(b => b.key === '12')).toMatchObject({ count: 1, amount: '12.4', share: 1 })
  })
})

describe('duplicates', () => {
  it('lists repeated values, most frequent first, equal counts by numeric value', () => {
    const values = ['10', '10', '9', '9', '9.00', '$1,200.00', '1200', '1200', '1200', '7', '-9', '100', '100', '0']
    const result = runDigitTest({ test: 'duplicates', input: { values } })
    // A text sort would put "10" and "100" before "9"; NUMERIC order puts 9 first.
    expect(result.bins.map(b => [b.key, b.count])).toEqual([['1200', 4], ['9', 3], ['10', 2], ['100', 2]])
    expect(result.n).toBe(12)
    expect(result.bins[0]!.share).toBeCloseTo(4 / 12, 12)
    expect(result.duplicates).toEqual({ distinct: 5, repeatedValues: 4, repeatedRows: 11 })
    expect(result.chiSquare).toBeNull()
  })

  it('shows only as many values as asked', () => {
    const values = ['1', '1', '2', '2', '3', '3', '3']
    expect(runDigitTest({ test: 'duplicates', duplicatesShown: 2, input: { values } }).bins.map(b => b.key)).toEqual(['3', '1'])
  })
})

describe('round numbers', () => {
  it('expects about a tenth of whole amounts to end in 0 under the law and sees an excess of rounding', () => {
    const whole = logUniformAmounts(5000).map(x => String(Math.round(Number(x))))
    const result = runDigitTest({ test: 'round-numbers', input: { values: whole } })
    expect(result.bins.map(b => b.key)).toEqual(['0', '00', '000'])
    const [tens, hundreds] = result.bins
    expect(tens!.expectedShare).toBeGreaterThan(0.1) // two-digit numbers end in 0 a little more often than 1 in 10
    expect(tens!.expectedShare).toBeLessThan(0.11)
    expect(tens!.count).toBeGreaterThanOrEqual(tens!.low!)
    expect(tens!.count).toBeLessThanOrEqual(tens!.high!)
    const rounded = runDigitTest({ test: 'round-numbers', input: { values: whole.map((x, i) => (i % 4 === 0 ? String(Math.round(Number(x) / 100) * 100) : x)) } })
    expect(rounded.bins[1]!.count).toBeGreaterThan(rounded.bins[1]!.high!)
    expect(rounded.bins[1]!.z).toBeGreaterThan(hundreds!.z! + 10)
  })

  it('in a column of cents, counts 1200.00 as rounded and expects it rarely', () => {
    const cents = logUniformAmounts(3000)
    const result = runDigitTest({ test: 'round-numbers', input: { values: [...cents, '1200.00', '3500.00'] } })
    expect(result.bins[0]!.count).toBe(cents.filter(x => /0\.00$/.test(x)).length + 2)
    expect(result.bins[0]!.expectedShare).toBeLessThan(0.0011) // whole multiples of 10 at cent precision: about 1 in 1000
  })
})

describe('threshold', () => {
  /** Roughly 1/x amounts between 500 and 2000 (about 1000 per 10% of the range near 1000). */
  const smooth = Array.from({ length: 14000 }, (_, i) => (500 * 4 ** (i / 14000)).toFixed(2))

  it('finds no bunching in smooth data', () => {
    const { threshold } = runDigitTest({ test: 'threshold', threshold: { limit: '1000' }, input: { values: smooth } })
    expect(threshold!.limit).toBe('1000')
    expect(threshold!.width).toBe('50')
    expect(threshold!.pBunching).toBeGreaterThan(0.05)
    expect(threshold!.pSplit).toBeGreaterThan(0.05)
    expect(threshold!.expectedBelow).toBeGreaterThan(threshold!.expectedAbove) // the 1/x slope
  })

  it('finds amounts bunched just under the limit', () => {
    const bunched = [...smooth, ...Array.from({ length: 150 }, (_, i) => (990 + (i % 10)).toFixed(2))]
    const result = runDigitTest({ test: 'threshold', threshold: { limit: '1000' }, input: { values: bunched } })
    const { threshold } = result
    expect(threshold!.below - threshold!.above).toBeGreaterThan(150)
    // The 1/x curve bends away from a straight line, so the interval is wide; it still holds the 150 planted and excludes 0.
    expect(threshold!.excessLow).toBeGreaterThan(0)
    expect(threshold!.excessLow).toBeLessThan(150)
    expect(threshold!.excessHigh).toBeGreaterThan(150)
    expect(threshold!.pBunching).toBeLessThan(0.01)
    expect(threshold!.pSplit).toBeLessThan(0.01)
    expect(result.bins.map(b => b.key)).toEqual(['750', '800', '850', '900', '950', '1000', '1050', '1100', '1150', '1200'])
    expect(result.bins[4]!.count).toBeGreaterThan(result.bins[4]!.high!)
    // Only the two buckets beside the limit carry a prediction range; the eight others are the fit.
    expect(result.bins.filter(b => b.low !== null).map(b => b.key)).toEqual(['950', '1000'])
    expect(result.excluded.belowMinimum).toBe(bunched.length - result.n)
  })

  it('models the scatter it sees: heaps at round amounts in open data are not read as bunching', () => {
    // movies.json "Production Budget" (vega-datasets 3.2.1): budgets heap at round millions, and the
    // bucket under 50,500,000 holds the heap at exactly 50,000,000 — as do the outer buckets at theirs.
    const values = jsonColumn('movies.json', 'Production Budget') as Array<number | null>
    const { threshold, bins } = runDigitTest({ test: 'threshold', threshold: { limit: '50500000' }, input: { values } })
    expect(bins.map(b => b.count)).toEqual([122, 19, 65, 14, 94, 18, 52, 14, 76, 8])
    // What a Poisson count around the same line would say (jStat's Poisson upper tail): "p = 5e-9".
    expect(jStat.lowRegGamma(threshold!.below, threshold!.expectedBelow)).toBeLessThan(1e-8)
    expect(threshold!.dispersion).toBeGreaterThan(20) // the outer buckets scatter 34 times more than Poisson
    expect(threshold!.pBunching).toBeGreaterThan(0.1)
    expect(threshold!.excessLow).toBeLessThan(0)
  })

  it('puts bucket edges where exact decimals put them', () => {
    const band = thresholdBand({ limit: '0.3', width: '0.01' })
    // In floating point (0.29 − 0.25) / 0.01 = 3.9999999999999996, which floors into the wrong bucket.
    expect(Math.floor((0.29 - 0.25) / 0.01)).toBe(3)
    expect(thresholdBucket(band, toDecimal('0.29'))).toBe(4)
    expect(thresholdBucket(band, toDecimal('0.3'))).toBe(5)
    expect(thresholdBucket(band, toDecimal('-0.2999'))).toBe(4)
    expect(thresholdBucket(band, toDecimal('0.35'))).toBeNull()
    expect(thresholdBucket(band, toDecimal('0.25'))).toBe(0)
  })

  it('refuses a band that would reach below zero, and a missing limit', () => {
    expect(() => thresholdBand({ limit: 100, width: 30 })).toThrow(RangeError)
    expect(() => runDigitTest({ test: 'threshold', input: { values: ['1'] } })).toThrow(RangeError)
  })
})
