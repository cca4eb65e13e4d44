import { buildBins } from './bin-statistics'
import { chiSquare } from './chi-square'
import { leadingShares, lastTwoShares, secondDigitShares } from './expected-shares'
import { kolmogorovSmirnov } from './kolmogorov-smirnov'
import { madOf } from './mad'
import { mantissaArc } from './mantissa-arc'
import { assertCountsAddUp, excludedOf, NO_STATISTICS, type TestOutcome } from './outcome'
import type { DigitRecord, DistributionCounts, DistributionTest, SignFilter } from './types'

export interface DistributionDefinition {
  /** The digit-record field the test counts. */
  field: keyof Pick<DigitRecord, 'firstDigit' | 'secondDigit' | 'firstTwo' | 'firstThree' | 'lastTwo'>
  keys: readonly string[]
  shares: readonly number[]
  /** Whether the mantissa arc applies (the first-digit family). */
  arc: boolean
  /**
   * Whether Kolmogorov–Smirnov applies: it needs bins in a natural order. The endings 00–99 have
   * none that matters (00 sits next to 99 as much as to 01), so D would change with the order.
   */
  ks: boolean
}

function range(from: number, to: number, width = 1): string[] {
  return Array.from({ length: to - from + 1 }, (_, i) => String(from + i).padStart(width, '0'))
}

export const DISTRIBUTIONS: Record<DistributionTest, DistributionDefinition> = {
  'first-digit': { field: 'firstDigit', keys: range(1, 9), shares: leadingShares(1, 9), arc: true, ks: true },
  'second-digit': { field: 'secondDigit', keys: range(0, 9), shares: secondDigitShares(), arc: false, ks: true },
  'first-two-digits': { field: 'firstTwo', keys: range(10, 99), shares: leadingShares(10, 99), arc: true, ks: true },
  'first-three-digits': { field: 'firstThree', keys: range(100, 999), shares: leadingShares(100, 999), arc: true, ks: true },
  'last-two-digits': { field: 'lastTwo', keys: range(0, 99, 2), shares: lastTwoShares(), arc: false, ks: false },
}

/** One entry per distribution test, made by `make`: spread into a `Record<TestName, …>` beside the other tests. */
export function byDistribution<T>(make: (test: DistributionTest) => T): Record<DistributionTest, T> {
  return Object.fromEntries(Object.keys(DISTRIBUTIONS).map(test => [test, make(test as DistributionTest)])) as Record<DistributionTest, T>
}

/** Bin text for a key as SQL returns it: last two digits keep their leading zero ("05"). */
export function keyText(test: DistributionTest, key: number | string): string {
  return test === 'last-two-digits' ? String(key).padStart(2, '0') : String(key)
}

/** Each test's bin index by key, as a number and as its text ("05"): built once, read for every set of counts. */
const BIN_INDEX = byDistribution(test => new Map<number | string, number>(DISTRIBUTIONS[test].keys.flatMap((key, i) => [[key, i], [Number(key), i]])))

/** Counts keyed by a digit field → per-bin counts in key order, and how many values have no key. */
function binCountsOf(test: DistributionTest, counts: DistributionCounts, sign: SignFilter) {
  const index = BIN_INDEX[test]
  const binCounts = new Array<number>(DISTRIBUTIONS[test].keys.length).fill(0)
  let belowMinimum = 0
  let n = 0
  for (const { key, count } of counts.keys) {
    if (key === null) {
      belowMinimum += count
      continue
    }
    const i = index.get(key) ?? index.get(keyText(test, key))
    if (i === undefined) throw new RangeError(`Key ${key} is not a bin of the ${test} test`)
    binCounts[i]! += count
    n += count
  }
  assertCountsAddUp(n + belowMinimum, counts.status, sign)
  return { binCounts, n, excluded: excludedOf(counts.status, sign, belowMinimum) }
}

/** Counts keyed by a digit field → bins and every statistic of a distribution test. */
export function runDistributionTest(test: DistributionTest, counts: DistributionCounts, sign: SignFilter): TestOutcome {
  const definition = DISTRIBUTIONS[test]
  const { binCounts, n, excluded } = binCountsOf(test, counts, sign)
  const { bins, binsOutside } = buildBins(n, definition.keys, binCounts, definition.shares)
  if (n === 0) return { ...NO_STATISTICS, n, excluded, bins }
  const shares = bins.map(bin => bin.share)
  const chi = chiSquare(binCounts, definition.shares)
  return {
    ...NO_STATISTICS,
    n,
    excluded,
    bins,
    chiSquare: chi,
    mad: madOf(test, n, shares, definition.shares, chi.p),
    ks: definition.ks ? kolmogorovSmirnov(shares, definition.shares, n) : null,
    arc: definition.arc && counts.arc ? mantissaArc(counts.arc, n) : null,
    binsOutside,
  }
}

/**
 * What a group's ranking reads of a distribution test (rankGroups): n, the MAD and chi-square, the
 * same numbers runDistributionTest gives, without the bins, KS and arc that no ranking shows. A
 * grouped test asks this of every group, so it is kept to what is read.
 */
export function rankingOutcome(test: DistributionTest, counts: DistributionCounts, sign: SignFilter): TestOutcome {
  const definition = DISTRIBUTIONS[test]
  const { binCounts, n, excluded } = binCountsOf(test, counts, sign)
  if (n === 0) return { ...NO_STATISTICS, n, excluded, bins: [] }
  const chi = chiSquare(binCounts, definition.shares)
  return { ...NO_STATISTICS, n, excluded, bins: [], chiSquare: chi, mad: madOf(test, n, binCounts.map(count => count / n), definition.shares, chi.p) }
}
