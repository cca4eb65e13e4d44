import jStat from 'jstat'
import { binomialAtMost } from './tails'
import type { Bin, BinsOutside } from './types'

/**
 * Z for one bin with the continuity correction of Fleiss (1981) as digit tests use it (Nigrini 2012):
 * (|p̂ − p| − 1/(2N)) / sqrt(p(1 − p)/N), the 1/(2N) term only when it is smaller than |p̂ − p|.
 * Signed: positive when the bin holds more than expected.
 */
export function binZ(count: number, n: number, p: number): number {
  if (n === 0 || p <= 0 || p >= 1) return 0
  const gap = count / n - p
  const correction = 1 / (2 * n)
  const corrected = Math.abs(gap) > correction ? Math.abs(gap) - correction : Math.abs(gap)
  return Math.sign(gap) * corrected / Math.sqrt(p * (1 - p) / n)
}

/**
 * Smallest k with P(X ≤ k) ≥ q. The search starts at the normal approximation's guess and steps
 * from there, so it needs a few evaluations of the CDF instead of the ~log2(n) of a bisection:
 * a grouped first-three-digits test asks for two quantiles per bin of every group.
 */
export function binomialQuantile(q: number, n: number, p: number): number {
  if (n <= 0 || p <= 0) return 0
  if (p >= 1) return n
  const guess = Math.round(n * p + normalQuantile(q) * Math.sqrt(n * p * (1 - p)))
  let k = Math.min(n, Math.max(0, guess))
  if (binomialAtMost(k, n, p) >= q) {
    while (k > 0 && binomialAtMost(k - 1, n, p) >= q) k--
  }
  else {
    while (k < n && binomialAtMost(k, n, p) < q) k++
  }
  return k
}

function normalQuantile(q: number): number {
  return jStat.normal.inv(q, 0, 1)
}

/**
 * The range of counts a conforming sample of size n shows at least 95% of the time:
 * from the 2.5% to the 97.5% quantile of Binomial(n, p), both ends included.
 */
export function binomialRange(n: number, p: number): { low: number, high: number } {
  return { low: binomialQuantile(0.025, n, p), high: binomialQuantile(0.975, n, p) }
}

/** Bins with count, share of n, expectation, 95% range and Z, from counts and expected shares in key order. */
export function buildBins(n: number, keys: readonly string[], counts: readonly number[], expectedShares: readonly number[]): Bin[] {
  return keys.map((key, i) => {
    const count = counts[i]!
    const p = expectedShares[i]!
    const { low, high } = binomialRange(n, p)
    return {
      key,
      count,
      share: n > 0 ? count / n : 0,
      expected: n * p,
      expectedShare: p,
      low,
      high,
      z: binZ(count, n, p),
      amount: null,
    }
  })
}

/**
 * Bins outside their binomial 95% range, with the number expected by chance: the sum over bins of
 * P(X < low) + P(X > high) under Binomial(n, p), exactly. Null when the bins carry no ranges.
 */
export function binsOutsideOf(bins: readonly Bin[], n: number): BinsOutside | null {
  const ranged = bins.filter(bin => bin.low !== null && bin.high !== null && bin.expectedShare !== null)
  if (ranged.length === 0) return null
  let expected = 0
  for (const bin of ranged) {
    expected += binomialAtMost(bin.low! - 1, n, bin.expectedShare!) + 1 - binomialAtMost(bin.high!, n, bin.expectedShare!)
  }
  return { count: ranged.filter(bin => bin.count < bin.low! || bin.count > bin.high!).length, expected }
}
