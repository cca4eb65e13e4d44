import { buildBins } from './bin-statistics'
import { roundShare } from './expected-shares'
import { assertCountsAddUp, excludedOf, NO_STATISTICS, type TestOutcome } from './outcome'
import type { RoundCounts, SignFilter } from './types'

const LEVELS = [1, 2, 3]
const KEYS = LEVELS.map(zeros => '0'.repeat(zeros))

/** A column's recorded precision ignores decimal places that fewer than this share of values carry. */
const PRECISION_SHARE = 0.05

/**
 * Round numbers: the share of values ≥ 10 that are whole multiples of 10, 100 and 1000 (keys "0",
 * "00", "000"; the bins nest), against what the law predicts for the same mix of lengths at the
 * column's recorded precision. The precision is the most decimal places that at least 5% of values
 * carry, so that in a column of cents 1200.00 counts as rounded and a stray 1.2345 does not make
 * every whole amount look suspicious. The 95% range and Z use the binomial at the pooled share.
 */
export function runRoundNumbersTest(counts: RoundCounts, sign: SignFilter): TestOutcome {
  const total = counts.cells.reduce((sum, cell) => sum + cell.count, 0)
  assertCountsAddUp(total, counts.status, sign)
  const precision = recordedPrecision(counts, total)

  const eligible = counts.cells.filter(cell => cell.integerDigits >= 2)
  const n = eligible.reduce((sum, cell) => sum + cell.count, 0)
  const observed = LEVELS.map(zeros => eligible
    .filter(cell => cell.fractionDigits === 0 && cell.trailingZeros >= zeros)
    .reduce((sum, cell) => sum + cell.count, 0))
  const expectedShares = LEVELS.map((zeros) => {
    if (n === 0) return 0
    const expected = eligible.reduce((sum, cell) => sum + cell.count * roundShare(cell.integerDigits, zeros, precision), 0)
    return expected / n
  })
  const { bins, binsOutside } = buildBins(n, KEYS, observed, expectedShares)
  return { ...NO_STATISTICS, n, excluded: excludedOf(counts.status, sign, total - n), bins, binsOutside }
}

function recordedPrecision(counts: RoundCounts, total: number): number {
  const byPlaces = new Map<number, number>()
  for (const cell of counts.cells) byPlaces.set(cell.fractionDigits, (byPlaces.get(cell.fractionDigits) ?? 0) + cell.count)
  let precision = 0
  for (const [places, count] of byPlaces) {
    if (count >= PRECISION_SHARE * total && places > precision) precision = places
  }
  return precision
}
