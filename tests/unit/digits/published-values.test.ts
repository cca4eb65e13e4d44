import { describe, expect, it } from 'vitest'
import { conformityOf, firstDigitCounts, fibonacciSeries, integerPowerSeries, powerSeries, runDigitTest } from '#shared/digits'
import { csvColumn, jsonColumn } from './open-data'

/** First digits straight from BigInt text, independent of the engine's reader. */
function bigintFirstDigits(values: bigint[]): number[] {
  const counts = Array.from({ length: 9 }, () => 0)
  for (const value of values) counts[Number(value.toString()[0]) - 1]!++
  return counts
}

function firstDigit(values: readonly string[]) {
  return runDigitTest({ test: 'first-digit', input: { values } })
}

describe('worked cases with exact integer arithmetic (docs/check-values.md, "Worked cases")', () => {
  const twoToThe = (count: number) => Array.from({ length: count }, (_, n) => 2n ** BigInt(n))
  const fibonacci = (count: number) => {
    const out: bigint[] = []
    for (let a = 1n, b = 1n; out.length < count; [a, b] = [b, a + b]) out.push(a)
    return out
  }

  it.each([
    // [case, series, BigInt check, counts, MAD, chi-square], all from the docs/check-values.md table.
    ['2^n, n = 0..99', powerSeries(2, 100), twoToThe(100), [30, 17, 13, 10, 7, 7, 6, 5, 5], 0.003879, 0.2210],
    ['2^n, n = 0..999', powerSeries(2, 1000), twoToThe(1000), [301, 176, 125, 97, 79, 69, 56, 52, 45], 0.000678, 0.1586],
    ['Fibonacci F1..F100', fibonacciSeries(100), fibonacci(100), [30, 18, 13, 9, 8, 6, 5, 7, 4], 0.006364, 1.0288],
    ['Fibonacci F1..F1000', fibonacciSeries(1000), fibonacci(1000), [301, 177, 125, 96, 80, 67, 56, 53, 45], 0.000820, 0.1695],
  ])('%s', (_, series, independent, counts, mad, chi) => {
    expect(series).toEqual(independent.map(String))
    expect(bigintFirstDigits(independent)).toEqual(counts)
    expect(firstDigitCounts(series)).toEqual(counts)
    const result = firstDigit(series)
    expect(result.bins.map(bin => bin.count)).toEqual(counts)
    expect(result.mad!.value).toBeCloseTo(mad, 6)
    expect(result.chiSquare!.statistic).toBeCloseTo(chi, 4)
    expect(result.chiSquare!.df).toBe(8)
  })

  it('about 30% of the powers of 2 start with 1 (docs/check-values.md, a common classroom fact)', () => {
    expect(firstDigit(powerSeries(2, 5000)).bins[0]!.share).toBeCloseTo(0.30103, 2)
  })

  it('the integers 1..N do not follow the law (docs/check-values.md, a common classroom fact)', () => {
    const result = firstDigit(integerPowerSeries(1, 9999))
    expect(result.bins.map(bin => bin.count)).toEqual(Array.from({ length: 9 }, () => 1111))
    expect(result.mad!.conformity).toBe('nonconforming')
    expect(result.chiSquare!.p).toBeLessThan(1e-10)
  })
})

describe('open data: movies.json "Worldwide Gross" (vega-datasets 3.2.1; values in docs/check-values.md)', () => {
  const result = runDigitTest({ test: 'first-digit', column: 'Worldwide Gross', input: { values: jsonColumn('movies.json', 'Worldwide Gross') as Array<number | null> } })

  it('counts 3147 positive values with the published first-digit counts', () => {
    expect(result.n).toBe(3147) // docs/check-values.md
    expect(result.bins.map(bin => bin.count)).toEqual([983, 565, 408, 292, 237, 192, 163, 165, 142]) // docs/check-values.md
    expect(result.excluded.blank + result.excluded.zero + result.n).toBe(jsonColumn('movies.json', 'Worldwide Gross').length)
  })

  it('has the published MAD, chi-square, p, Z and KS', () => {
    expect(result.mad!.value).toBeCloseTo(0.004614, 6) // docs/check-values.md (exact decimal arithmetic and SciPy)
    expect(conformityOf('first-digit', result.mad!.value)).toBe('close') // 0.004614 ≤ 0.006, Nigrini 2012 ranges in docs/check-values.md
    // 3,147 values are too few for the published ranges to be read (a conforming sample this size averages MAD 0.0042).
    expect(result.mad!.conformity).toBeNull()
    expect(result.mad!.reading).toBe('chance') // p 0.523
    expect(result.chiSquare!.statistic).toBeCloseTo(7.1290, 4) // docs/check-values.md
    expect(result.chiSquare!.p).toBeCloseTo(0.523, 3) // docs/check-values.md (SciPy)
    for (const bin of result.bins) expect(Math.abs(bin.z!)).toBeLessThan(1.96) // docs/check-values.md: every |Z| < 1.96
    expect(result.ks!.d).toBeCloseTo(0.01948, 5) // docs/check-values.md
    expect(result.ks!.critical).toBeCloseTo(0.02424, 5) // docs/check-values.md; 1.36/√3147
    expect(result.ks!.d).toBeLessThan(result.ks!.critical)
  })
})

describe('negative controls (vega-datasets 3.2.1; values in docs/check-values.md)', () => {
  it('airports.csv "latitude" is bounded and far from the law', () => {
    const result = firstDigit(csvColumn('airports.csv', 'latitude'))
    expect(result.n).toBe(3376) // docs/check-values.md
    expect(result.mad!.value).toBeCloseTo(0.143367, 6) // docs/check-values.md
    expect(result.mad!.reading).toBe('deviates') // 3,376 values: below the size where the ranges are read
    expect(result.suitability.map(f => f.code)).toContain('narrow-span')
  })

  it('zipcodes.csv "zip_code" is assigned and far from the law', () => {
    const result = firstDigit(csvColumn('zipcodes.csv', 'zip_code'))
    expect(result.mad!.value).toBeCloseTo(0.054925, 6) // docs/check-values.md
    expect(result.mad!.conformity).toBe('nonconforming')
    expect(result.suitability.map(f => f.code)).toContain('looks-assigned')
  })
})
