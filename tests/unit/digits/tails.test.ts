import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import { formatP, formatPValue } from '../../../shared/charts/p-value'
import { chiSquare, binomialAtMost, chiSquareUpper, P_FLOOR, studentUpper, t95 } from '#shared/digits'

/** |a/b − 1|: the relative error the issue asks to keep under 1e-6. */
const relative = (a: number, b: number) => Math.abs(a / b - 1)

function logSumExp(terms: number[]): number {
  const top = Math.max(...terms)
  return top + Math.log(terms.reduce((sum, t) => sum + Math.exp(t - top), 0))
}

const logFactorials = (() => {
  const table = [0]
  for (let k = 1; k <= 20000; k++) table.push(table[k - 1]! + Math.log(k))
  return table
})()

/**
 * Upper chi-square tail for even df in closed form, in log space (Abramowitz & Stegun 26.4.21):
 * Q(χ² | ν) = e^(−χ²/2) Σ_{j < ν/2} (χ²/2)^j / j!. Exact, and independent of any incomplete gamma code.
 */
function evenDfUpperLog(statistic: number, df: number): number {
  const x = statistic / 2
  const terms = Array.from({ length: df / 2 }, (_, j) => -x + j * Math.log(x) - logFactorials[j]!)
  return logSumExp(terms)
}

/**
 * Upper chi-square tail for odd df in closed form, in log space (Abramowitz & Stegun 26.4.4):
 * Q(χ² | ν) = 2Q(χ) + 2φ(χ) Σ_{r=1}^{(ν−1)/2} χ^(2r−1) / (1·3·…·(2r − 1)), with χ = √χ², φ the normal
 * density and Q(χ) its upper tail. Q(χ) comes from jStat below χ = 5 and from the asymptotic
 * Mills-ratio series above it (A&S 26.2.12, relative error under 945/χ^10); it is a small part
 * of the sum in the deep tail. Independent of the continued fraction and series the engine uses.
 */
function oddDfUpperLog(statistic: number, df: number): number {
  const chi = Math.sqrt(statistic)
  const logDensity = -statistic / 2 - 0.5 * Math.log(2 * Math.PI)
  const logNormalTail = chi < 5
    ? Math.log(1 - jStat.normal.cdf(chi, 0, 1))
    : logDensity - Math.log(chi) + Math.log(1 - chi ** -2 + 3 * chi ** -4 - 15 * chi ** -6 + 105 * chi ** -8)
  const terms = [Math.LN2 + logNormalTail]
  let logOddProduct = 0
  for (let r = 1; r <= (df - 1) / 2; r++) {
    logOddProduct += Math.log(2 * r - 1)
    terms.push(Math.LN2 + logDensity + (2 * r - 1) * Math.log(chi) - logOddProduct)
  }
  return logSumExp(terms)
}

describe('chi-square upper tail', () => {
  it.each([
    // Printed statistical tables (upper 5% and 1% points), as listed in docs/check-values.md.
    [8, 15.507, 0.05], [8, 20.090, 0.01], [9, 16.919, 0.05], [9, 21.666, 0.01], [89, 112.022, 0.05], [89, 122.942, 0.01],
    [99, 123.225, 0.05], [99, 134.642, 0.01], [899, 969.865, 0.05], [899, 1000.575, 0.01],
  ])('df %i at the printed point %f gives %f', (df, statistic, p) => {
    expect(chiSquareUpper(statistic, df)).toBeCloseTo(p, 4)
  })

  it('agrees with jStat (an independent implementation) to 1e-6 relative where 1 − CDF still holds its digits', () => {
    for (const df of [8, 9, 89, 99, 899]) {
      for (let statistic = df / 2; statistic < 8 * df + 80; statistic *= 1.15) {
        const p = 1 - jStat.chisquare.cdf(statistic, df)
        if (p < 1e-8) break
        expect(relative(chiSquareUpper(statistic, df), p)).toBeLessThan(1e-6)
      }
    }
  })

  it.each([
    ['even', [2, 8, 90, 900], evenDfUpperLog],
    ['odd', [9, 89, 99, 899], oddDfUpperLog],
  ] as const)('is right to 1e-6 relative down to 1e-300 for %s df, against the closed form', (_, dfs, closedFormLog) => {
    let checked = 0
    for (const df of dfs) {
      for (let statistic = df + 10; ; statistic *= 1.2) {
        const log = closedFormLog(statistic, df)
        if (log < Math.log(1e-300)) break
        expect(relative(chiSquareUpper(statistic, df), Math.exp(log))).toBeLessThan(1e-6)
        checked++
      }
    }
    expect(checked).toBeGreaterThan(40)
  })

  it('keeps the values that 1 − CDF turns into 0 or 2^-53', () => {
    // df 2: Q = exp(−χ²/2) exactly (A&S 26.4.21 with one term).
    expect(relative(chiSquareUpper(2 * Math.log(1 / 1.9e-17), 2), 1.9e-17)).toBeLessThan(1e-9)
    expect(relative(chiSquareUpper(2 * 690, 2), Math.exp(-690))).toBeLessThan(1e-9) // 2.17e-300
    const deep = 2 * -Math.log(9e-141)
    expect(relative(chiSquareUpper(deep, 2), 9e-141)).toBeLessThan(1e-9)
    expect(1 - jStat.chisquare.cdf(deep, 2)).toBe(0) // what subtracting from one gave
  })

  it('stops at the floor below 1e-300 and says so, never 0', () => {
    expect(chiSquareUpper(5000, 8)).toBe(P_FLOOR)
    expect(formatP(chiSquareUpper(5000, 8))).toBe('p < 1e-300')
    const counts = [9000, 0, 0, 0, 0, 0, 0, 0, 1000]
    const result = chiSquare(counts, [0.30103, 0.17609, 0.12494, 0.09691, 0.07918, 0.06695, 0.05799, 0.05115, 0.04576])
    expect(result.p).toBeGreaterThan(0)
    expect(formatP(result.p)).toBe('p < 1e-300')
  })

  it('prints p and q as a reader can quote them', () => {
    expect(formatP(0.5234)).toBe('p = 0.52')
    expect(formatP(0.00431)).toBe('p = 0.0043')
    expect(formatP(1.9e-17)).toBe('p = 1.9e-17')
    expect(formatP(0.0123, 'q')).toBe('q = 0.012')
    expect(formatPValue(9e-141)).toBe('9.0e-141')
    expect(formatPValue(P_FLOOR)).toBe('< 1e-300')
  })
})

describe('binomial tail', () => {
  /** log P(X ≤ k) by summing the pmf term by term in log space (exact up to rounding). */
  function binomialLowerLog(k: number, n: number, p: number): number {
    const terms = []
    for (let j = 0; j <= k; j++) terms.push(logFactorials[n]! - logFactorials[j]! - logFactorials[n - j]! + j * Math.log(p) + (n - j) * Math.log1p(-p))
    return logSumExp(terms)
  }

  it.each([[2, 100, 0.1], [10, 1000, 0.05], [300, 2000, 0.30103], [800, 3000, 0.30103], [1000, 20000, 0.04576], [30, 60, 0.5]])(
    'P(X ≤ %i) for Binomial(%i, %f) matches a log-space pmf sum to 1e-6 relative, deep tails included',
    (k, n, p) => {
      expect(relative(binomialAtMost(k, n, p), Math.exp(binomialLowerLog(k, n, p)))).toBeLessThan(1e-6)
    },
  )
})

describe('Student\'s t upper tail', () => {
  it.each([[6, 1.943, 0.05], [6, 2.447, 0.025], [6, 3.143, 0.01], [6, 3.707, 0.005], [10, 2.228, 0.025], [30, 2.042, 0.025]])(
    'df %i at the printed point %f gives %f (printed t tables)',
    (df, t, p) => {
      expect(studentUpper(t, df)).toBeCloseTo(p, 4)
    },
  )

  it('matches closed forms far into the tail: df 1 (Cauchy) and df 2', () => {
    for (const t of [3, 30, 3e3, 3e6, 3e12]) {
      expect(relative(studentUpper(t, 1), Math.atan(1 / t) / Math.PI)).toBeLessThan(1e-9)
      const r = Math.sqrt(2 + t * t)
      expect(relative(studentUpper(t, 2), 1 / (r * (r + t)))).toBeLessThan(1e-9)
    }
    expect(studentUpper(-2.447, 6)).toBeCloseTo(0.975, 4)
    expect(t95(6)).toBeCloseTo(2.447, 3) // printed t tables
    expect(t95(30)).toBeCloseTo(2.042, 3) // printed t tables
  })
})
