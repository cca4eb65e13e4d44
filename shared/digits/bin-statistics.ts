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

/** A quantile k of a binomial, with the CDF at k − 1 and at k as its search found them. */
interface Quantile {
  k: number
  /** P(X ≤ k − 1) */
  before: number
  /** P(X ≤ k) */
  at: number
}

/**
 * Smallest k with P(X ≤ k) ≥ q. The search starts at the normal approximation's guess and steps
 * from there, so it needs a few evaluations of the CDF instead of the ~log2(n) of a bisection:
 * a grouped first-three-digits test asks for two quantiles per bin of every group. The CDF values
 * beside k come with it, because they are the bin's chance of falling outside its range.
 */
function binomialQuantile(q: number, n: number, p: number): Quantile {
  if (n <= 0 || p <= 0 || p >= 1) {
    const k = n > 0 && p >= 1 ? n : 0
    return { k, before: binomialAtMost(k - 1, n, p), at: binomialAtMost(k, n, p) }
  }
  const guess = Math.round(n * p + normalQuantile(q) * Math.sqrt(n * p * (1 - p)))
  let k = Math.min(n, Math.max(0, guess))
  let at = binomialAtMost(k, n, p)
  if (at >= q) {
    let before = binomialAtMost(k - 1, n, p)
    while (k > 0 && before >= q) {
      k--
      at = before
      before = binomialAtMost(k - 1, n, p)
    }
    return { k, before, at }
  }
  let before = at
  while (k < n && at < q) {
    k++
    before = at
    at = binomialAtMost(k, n, p)
  }
  return { k, before, at }
}

function normalQuantile(q: number): number {
  return jStat.normal.inv(q, 0, 1)
}

/** The 2.5% and 97.5% quantiles of Binomial(n, p), and the chance of a count outside them. */
function rangeWithChance(n: number, p: number) {
  const low = binomialQuantile(0.025, n, p)
  const high = binomialQuantile(0.975, n, p)
  return { low: low.k, high: high.k, outside: low.before + 1 - high.at }
}

/**
 * The range of counts a conforming sample of size n shows at least 95% of the time:
 * from the 2.5% to the 97.5% quantile of Binomial(n, p), both ends included.
 */
export function binomialRange(n: number, p: number): { low: number, high: number } {
  const { low, high } = rangeWithChance(n, p)
  return { low, high }
}

/**
 * Bins with count, share of n, expectation, 95% range and Z, from counts and expected shares in key
 * order; and the bins outside their range, with the number expected by chance: the sum over bins of
 * P(X < low) + P(X > high) under Binomial(n, p), exactly (null without bins).
 */
export function buildBins(n: number, keys: readonly string[], counts: readonly number[], expectedShares: readonly number[]): { bins: Bin[], binsOutside: BinsOutside | null } {
  let outside = 0
  let expected = 0
  const bins = keys.map((key, i): Bin => {
    const count = counts[i]!
    const p = expectedShares[i]!
    const range = rangeWithChance(n, p)
    expected += range.outside
    if (count < range.low || count > range.high) outside++
    return {
      key,
      count,
      share: n > 0 ? count / n : 0,
      expected: n * p,
      expectedShare: p,
      low: range.low,
      high: range.high,
      z: binZ(count, n, p),
      amount: null,
    }
  })
  return { bins, binsOutside: bins.length ? { count: outside, expected } : null }
}
