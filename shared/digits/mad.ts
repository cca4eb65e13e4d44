import type { Conformity, DistributionTest, Mad } from './types'

/**
 * Upper ends of close, acceptable and marginally acceptable conformity (Nigrini 2012, "Benford's
 * Law", Wiley, Table 7.1; from memory, as listed in docs/check-values.md). Tests without published
 * ranges have none.
 */
export const MAD_RANGES: Partial<Record<DistributionTest, readonly [number, number, number]>> = {
  'first-digit': [0.006, 0.012, 0.015],
  'second-digit': [0.008, 0.010, 0.012],
  'first-two-digits': [0.0012, 0.0018, 0.0022],
  'first-three-digits': [0.00036, 0.00044, 0.00050],
}

const LEVELS: readonly Conformity[] = ['close', 'acceptable', 'marginal']

/**
 * Each range includes its upper end: a MAD of exactly 0.006 in the first-digit test is close
 * conformity. The MAD is rounded to 12 decimals first so that float noise in the sum cannot push
 * a value on a boundary into the next range.
 */
export function conformityOf(test: DistributionTest, mad: number): Conformity | null {
  const ranges = MAD_RANGES[test]
  if (!ranges) return null
  const value = Math.round(mad * 1e12) / 1e12
  const level = ranges.findIndex(upper => value <= upper)
  return level < 0 ? 'nonconforming' : LEVELS[level]!
}

/** Mean absolute deviation of shares from expected shares. */
export function meanAbsoluteDeviation(shares: readonly number[], expectedShares: readonly number[]): number {
  let total = 0
  shares.forEach((share, i) => {
    total += Math.abs(share - expectedShares[i]!)
  })
  return total / shares.length
}

/**
 * The MAD a conforming sample of size n shows on average, from the normal approximation of each
 * bin: (1/K) Σ sqrt(2 p(1 − p) / (π n)); first digit ≈ 0.2348/√n.
 */
export function expectedMad(n: number, expectedShares: readonly number[]): number {
  if (n === 0) return 0
  let total = 0
  for (const p of expectedShares) total += Math.sqrt(2 * p * (1 - p) / (Math.PI * n))
  return total / expectedShares.length
}

/**
 * MAD with its conformity, the MAD expected at this n and the excess over it
 * (Barney & Schulzke 2016, Journal of Forensic Accounting Research 1(1)).
 */
export function madOf(test: DistributionTest | null, n: number, shares: readonly number[], expectedShares: readonly number[]): Mad {
  const value = meanAbsoluteDeviation(shares, expectedShares)
  const expected = expectedMad(n, expectedShares)
  return { value, conformity: test ? conformityOf(test, value) : null, expected, excess: value - expected }
}
