import type { Ks } from './types'

/**
 * Largest gap between cumulative actual and expected shares, bins taken in digit order, with the
 * 5% critical value 1.36/√n (Massey 1951; common practice for digit tests, conservative for
 * discrete data). Needs n > 0.
 */
export function kolmogorovSmirnov(shares: readonly number[], expectedShares: readonly number[], n: number): Ks {
  let actual = 0
  let expected = 0
  let d = 0
  shares.forEach((share, i) => {
    actual += share
    expected += expectedShares[i]!
    d = Math.max(d, Math.abs(actual - expected))
  })
  return { d, critical: 1.36 / Math.sqrt(n) }
}
