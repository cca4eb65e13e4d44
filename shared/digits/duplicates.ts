import { compareDecimal, decimalToText, toDecimal } from './decimal'
import { excludedOf, NO_STATISTICS, signCount, type TestOutcome } from './outcome'
import type { Bin, DuplicateCounts, SignFilter } from './types'

export const DEFAULT_DUPLICATES_SHOWN = 20

/**
 * Duplicated amounts: the most frequent exact values with counts and shares of n, most frequent
 * first and, among equal counts, smallest value first (as ORDER BY count DESC, value sorts NUMERIC).
 * The law predicts no particular count for one exact value, so bins have no expectation.
 */
export function runDuplicatesTest(counts: DuplicateCounts, sign: SignFilter, shown = DEFAULT_DUPLICATES_SHOWN): TestOutcome {
  const n = signCount(counts.status, sign)
  const top = counts.top
    .filter(entry => entry.count > 1)
    .map(entry => ({ ...entry, decimal: toDecimal(entry.value) }))
    .sort((a, b) => b.count - a.count || compareDecimal(a.decimal, b.decimal))
    .slice(0, shown)
  const bins: Bin[] = top.map(({ decimal, count }) => ({
    key: decimalToText(decimal),
    count,
    share: n > 0 ? count / n : 0,
    expected: null,
    expectedShare: null,
    low: null,
    high: null,
    z: null,
    amount: null,
  }))
  return {
    ...NO_STATISTICS,
    n,
    excluded: excludedOf(counts.status, sign, 0),
    bins,
    duplicates: { distinct: counts.distinct, repeatedValues: counts.repeated.values, repeatedRows: counts.repeated.rows },
  }
}
