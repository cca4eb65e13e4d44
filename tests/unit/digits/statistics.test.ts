import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import { binomialRange, binZ, chiSquare, DISTRIBUTIONS, leadingShares, roundShare, secondDigitShares, conformityOf, expectedMad, MAD_RANGES, mantissaArc, integerPowerSeries, powerSeries, runDigitTest } from '#shared/digits'
import type { DistributionTest } from '#shared/digits'

describe('expected shares (docs/check-values.md; Benford 1938, Hill 1995)', () => {
  it('first digit', () => {
    const published = [0.30103, 0.17609, 0.12494, 0.09691, 0.07918, 0.06695, 0.05799, 0.05115, 0.04576]
    leadingShares(1, 9).forEach((share, i) => expect(share).toBeCloseTo(published[i]!, 5))
  })

  it('second digit', () => {
    const published = [0.11968, 0.11389, 0.10882, 0.10433, 0.10031, 0.09668, 0.09337, 0.09035, 0.08757, 0.08500]
    secondDigitShares().forEach((share, i) => expect(share).toBeCloseTo(published[i]!, 5))
    expect(secondDigitShares()[2]).toBeCloseTo(0.109, 3) // Hill 1995 quotes P(D2 = 2) ≈ 0.109
  })

  it('first two and first three digits, summing to one', () => {
    const two = DISTRIBUTIONS['first-two-digits'].shares
    const three = DISTRIBUTIONS['first-three-digits'].shares
    expect(two[0]).toBeCloseTo(0.041393, 6) // P(10)
    expect(two[89]).toBeCloseTo(0.004365, 6) // P(99)
    expect(three[0]).toBeCloseTo(0.0043214, 7) // P(100)
    expect(three[899]).toBeCloseTo(0.00043451, 8) // P(999)
    for (const test of Object.keys(DISTRIBUTIONS) as DistributionTest[]) {
      expect(DISTRIBUTIONS[test].shares.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12)
    }
  })

  it('last two digits are uniform (common practice)', () => {
    expect(new Set(DISTRIBUTIONS['last-two-digits'].shares)).toEqual(new Set([0.01]))
    expect(DISTRIBUTIONS['last-two-digits'].keys.slice(0, 3)).toEqual(['00', '01', '02'])
  })

  it('round shares match a brute-force sum over whole numbers under the law', () => {
    // Independent: sum log10(1 + 1/M) over all D-digit M (in units of 10^-f) that are multiples of 10^(k+f).
    const bruteForce = (digits: number, zeros: number, places: number) => {
      let share = 0
      const step = 10 ** (zeros + places)
      for (let m = 10 ** (digits + places - 1); m < 10 ** (digits + places); m += step) share += Math.log10(1 + 1 / m)
      return share
    }
    for (const [digits, zeros, places] of [[2, 1, 0], [3, 1, 0], [3, 2, 0], [4, 1, 0], [4, 3, 0], [3, 1, 2], [4, 2, 1]] as const) {
      expect(roundShare(digits, zeros, places)).toBeCloseTo(bruteForce(digits, zeros, places), 12)
    }
    expect(roundShare(3, 3, 0)).toBe(0)
    // Past four prefix digits the engine extrapolates; the brute-force sum agrees within 1e-8 relative.
    for (const [digits, zeros] of [[5, 0], [6, 1], [7, 2]] as const) {
      expect(Math.abs(roundShare(digits, zeros, 1) / bruteForce(digits, zeros, 1) - 1)).toBeLessThan(1e-8)
    }
  })
})

describe('MAD conformity (ranges from memory: Nigrini 2012, Table 7.1, via docs/check-values.md)', () => {
  it.each(Object.entries(MAD_RANGES) as Array<[DistributionTest, readonly [number, number, number]]>)('%s: each range includes its upper end', (test, [close, acceptable, marginal]) => {
    expect(conformityOf(test, 0)).toBe('close')
    expect(conformityOf(test, close)).toBe('close')
    expect(conformityOf(test, close + 1e-9)).toBe('acceptable')
    expect(conformityOf(test, acceptable)).toBe('acceptable')
    expect(conformityOf(test, acceptable + 1e-9)).toBe('marginal')
    expect(conformityOf(test, marginal)).toBe('marginal')
    expect(conformityOf(test, marginal + 1e-9)).toBe('nonconforming')
  })

  it('holds the published boundaries', () => {
    expect(MAD_RANGES['first-digit']).toEqual([0.006, 0.012, 0.015])
    expect(MAD_RANGES['second-digit']).toEqual([0.008, 0.010, 0.012])
    expect(MAD_RANGES['first-two-digits']).toEqual([0.0012, 0.0018, 0.0022])
    expect(MAD_RANGES['first-three-digits']).toEqual([0.00036, 0.00044, 0.00050])
  })

  it('a boundary survives float noise: 0.1 + 0.2 − 0.3 style error does not move it', () => {
    expect(conformityOf('first-digit', 0.006 + 1e-17)).toBe('close')
    expect(conformityOf('first-digit', 0.1 * 0.06)).toBe('close') // 0.006000000000000001 in floating point
  })

  it('has no ranges for the last-two-digit test', () => {
    expect(conformityOf('last-two-digits', 0.001)).toBeNull()
  })
})

describe('expected and excess MAD (docs/check-values.md; Barney & Schulzke 2016)', () => {
  it('is about 0.2348/√N for the first digit and 0.0793/√N for the first two', () => {
    for (const n of [100, 1000, 3147, 100000]) {
      expect(expectedMad(n, DISTRIBUTIONS['first-digit'].shares) * Math.sqrt(n)).toBeCloseTo(0.2348, 4)
      expect(expectedMad(n, DISTRIBUTIONS['first-two-digits'].shares) * Math.sqrt(n)).toBeCloseTo(0.0793, 4)
    }
  })

  it('at N = 1000 a conforming first-digit sample already has MAD ≈ 0.0074', () => {
    expect(expectedMad(1000, DISTRIBUTIONS['first-digit'].shares)).toBeCloseTo(0.0074, 4)
  })

  it('reports the excess over the expectation', () => {
    const result = runDigitTest({ test: 'first-digit', input: { values: powerSeries(3, 500) } })
    expect(result.mad!.excess).toBeCloseTo(result.mad!.value - result.mad!.expected!, 15)
    expect(result.mad!.expected).toBeCloseTo(0.2348 / Math.sqrt(500), 4)
  })
})

describe('Z with continuity correction (Fleiss 1981 as Nigrini uses it; docs/check-values.md)', () => {
  it('leaves out the 1/(2N) term when it is not smaller than |p̂ − p|', () => {
    // Hand calculation: |0.30 − 0.30103| = 0.00103 < 1/200, so Z = 0.00103 / sqrt(0.30103·0.69897/100) = 0.022454.
    expect(binZ(30, 100, Math.log10(2))).toBeCloseTo(-0.022454, 6)
  })

  it('subtracts the 1/(2N) term when it is smaller', () => {
    // Hand calculation: (0.40 − 0.30103 − 0.005) / 0.0458722 = 2.048590.
    expect(binZ(40, 100, Math.log10(2))).toBeCloseTo(2.048590, 6)
  })

  it('crosses 1.96 and 2.576 where the normal table says (two-sided 5% and 1%)', () => {
    expect(jStat.normal.inv(0.975, 0, 1)).toBeCloseTo(1.96, 2) // printed normal table
    expect(jStat.normal.inv(0.995, 0, 1)).toBeCloseTo(2.576, 3) // printed normal table
  })
})

describe('the binomial 95% range of counts', () => {
  /** Exact cumulative sum of the binomial pmf, built term by term (independent of jStat's beta function). */
  function exactRange(n: number, p: number) {
    let pmf = (1 - p) ** n
    let cdf = 0
    let low: number | null = null
    for (let k = 0; k <= n; k++) {
      cdf += pmf
      if (low === null && cdf >= 0.025) low = k
      if (cdf >= 0.975) return { low: low!, high: k }
      pmf *= ((n - k) / (k + 1)) * (p / (1 - p))
    }
    return { low: low ?? n, high: n }
  }

  it.each([
    [100, Math.log10(2)], [100, Math.log10(10 / 9)], [1000, Math.log10(2)], [1000, Math.log10(1 + 1 / 99)], [50, 0.01], [3147, 0.04576],
    // Small and large n·p, where a search that starts from the normal approximation has the most steps to take.
    [5, 0.3], [12, 0.00043451], [20000, 0.00043451], [1000, 0.5],
  ])('matches an exact cumulative sum at n = %i, p = %f', (n, p) => {
    expect(binomialRange(n, p)).toEqual(exactRange(n, p))
  })

  it('covers at least 95% and is no wider than needed', () => {
    const n = 400
    const p = 0.12494
    const { low, high } = binomialRange(n, p)
    const cdf = (k: number) => jStat.binomial.cdf(k, n, p)
    expect(cdf(high) - cdf(low - 1)).toBeGreaterThanOrEqual(0.95)
    expect(cdf(low)).toBeGreaterThanOrEqual(0.025)
    expect(cdf(low - 1)).toBeLessThan(0.025)
    expect(cdf(high - 1)).toBeLessThan(0.975)
  })
})

describe('chi-square p-values at printed critical values (printed statistical tables; also jStat)', () => {
  /** Counts with exactly the wanted statistic: move t values from one bin to another. */
  function countsWithStatistic(shares: readonly number[], n: number, statistic: number): number[] {
    const [a, b] = [shares[0]!, shares[1]!]
    const t = Math.sqrt(statistic / (1 / (n * a) + 1 / (n * b)))
    return shares.map((share, i) => n * share + (i === 0 ? t : i === 1 ? -t : 0))
  }

  it.each([
    ['first-digit', 8, 15.507, 0.05], ['first-digit', 8, 20.090, 0.01],
    ['second-digit', 9, 16.919, 0.05], ['second-digit', 9, 21.666, 0.01],
    ['first-two-digits', 89, 112.022, 0.05], ['first-two-digits', 89, 122.942, 0.01],
    ['last-two-digits', 99, 123.225, 0.05], ['last-two-digits', 99, 134.642, 0.01],
    ['first-three-digits', 899, 969.865, 0.05], ['first-three-digits', 899, 1000.575, 0.01],
  ] as const)('%s: df %i, statistic %f gives p %f', (test, df, critical, p) => {
    const shares = DISTRIBUTIONS[test].shares
    const result = chiSquare(countsWithStatistic(shares, 1e6, critical), shares)
    expect(result.df).toBe(df)
    expect(result.statistic).toBeCloseTo(critical, 6)
    expect(result.p).toBeCloseTo(p, 4)
  })
})

describe('mantissa arc (Rayleigh; Jammalamadaka & SenGupta 2001, via docs/check-values.md)', () => {
  it('matches L² computed with Math.log10 on small exact integers', () => {
    // Independent: 2^n for n < 50 and 1..999 are exact doubles, so log10 is accurate here.
    for (const values of [powerSeries(2, 50, 1), integerPowerSeries(1, 999)]) {
      let cos = 0
      let sin = 0
      for (const value of values) {
        const m = Math.log10(Number(value)) % 1
        cos += Math.cos(2 * Math.PI * m)
        sin += Math.sin(2 * Math.PI * m)
      }
      const l2 = (cos / values.length) ** 2 + (sin / values.length) ** 2
      const result = runDigitTest({ test: 'first-digit', input: { values } })
      expect(result.arc!.l2).toBeCloseTo(l2, 10)
      expect(result.arc!.p).toBeCloseTo(Math.exp(-values.length * l2), 10)
    }
  })

  it('finds no bunching in 2^n and strong bunching in 1..N', () => {
    expect(runDigitTest({ test: 'first-digit', input: { values: powerSeries(2, 1000) } }).arc!.p).toBeGreaterThan(0.5)
    expect(runDigitTest({ test: 'first-digit', input: { values: integerPowerSeries(1, 5000) } }).arc!.p).toBeLessThan(1e-6)
  })

  it('is computed for the first-digit family only', () => {
    const values = powerSeries(2, 300, 10)
    expect(runDigitTest({ test: 'first-two-digits', input: { values } }).arc).not.toBeNull()
    expect(runDigitTest({ test: 'first-three-digits', input: { values } }).arc).not.toBeNull()
    expect(runDigitTest({ test: 'second-digit', input: { values } }).arc).toBeNull()
    expect(runDigitTest({ test: 'last-two-digits', input: { values } }).arc).toBeNull()
  })

  it('uses the sums it is given', () => {
    expect(mantissaArc({ cos: 30, sin: 40 }, 100)).toEqual({ l2: 0.25, p: Math.exp(-25) })
  })
})
