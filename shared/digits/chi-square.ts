import { chiSquareUpper } from './tails'
import type { ChiSquare } from './types'

/** Pearson's chi-square of counts (n > 0) against expected shares, df = bins − 1, p from the upper tail itself. */
export function chiSquare(counts: readonly number[], expectedShares: readonly number[]): ChiSquare {
  const n = counts.reduce((a, b) => a + b, 0)
  let statistic = 0
  counts.forEach((count, i) => {
    const expected = n * expectedShares[i]!
    statistic += (count - expected) ** 2 / expected
  })
  const df = counts.length - 1
  return { statistic, df, p: chiSquareUpper(statistic, df) }
}
