import {
  countDistribution, countDuplicates, countRound, countSummation, countThreshold, profileOf, recordsOf, type Cell,
} from './count-records'
import { rankingOutcome, runDistributionTest } from './distribution-tests'
import { DEFAULT_DUPLICATES_SHOWN, runDuplicatesTest } from './duplicates'
import { rankGroups } from './groups'
import { detectNumberStyle } from './number-style'
import { DOT_STYLE } from './read-number'
import type { TestOutcome } from './outcome'
import { runRoundNumbersTest } from './round-numbers'
import { runSummationTest } from './summation'
import { checkSuitability, MINIMUM_VALUES } from './suitability'
import { runThresholdTest } from './threshold'
import { isGroupable } from './types'
import type {
  ColumnProfile, DigitRecord, DistributionTest, GroupableTest, NumberStyle, SignFilter, TestCountsMap, TestName, TestResult,
  ThresholdOptions,
} from './types'

export const CAUTION = 'A digit test is a screen, not proof: a deviation says where to look, never that anything is wrong. '
  + 'Read the rows behind it and the ordinary reasons they may differ before drawing any conclusion.'

/** Raw cells (a convenience for tests and small jobs), or the counts the server's GROUP BY queries give. */
export type TestInput<T extends TestName>
  = | { values: readonly Cell[], style?: NumberStyle }
    | { counts: TestCountsMap[T], profile?: ColumnProfile | null }

export interface DigitTestRequest<T extends TestName = TestName> {
  test: T
  input: TestInput<T>
  column?: string | null
  /** Positives and negatives are tested apart; default positive. */
  sign?: SignFilter
  /** Required by the threshold test. */
  threshold?: ThresholdOptions
  /** How many repeated values the duplicates test lists; default 20. */
  duplicatesShown?: number
  /**
   * One run per group. Groups under minSize (default: a fifth of the test's minimum, where the
   * rarest bin expects one value) are skipped and counted; those between it and the test's minimum
   * are listed and read "too few values to read".
   */
  groups?: { minSize?: number, items: Array<{ key: string, input: TestInput<T> }> }
}

interface Options {
  threshold?: ThresholdOptions
  duplicatesShown: number
  /** A group's ranking reads only n, the MAD and chi-square (rankingOutcome). */
  ranking: boolean
}

interface TestHandler<C> {
  count(records: readonly DigitRecord[], sign: SignFilter, options: Options): C
  run(counts: C, sign: SignFilter, options: Options): TestOutcome
}

function requireThreshold(options: Options): ThresholdOptions {
  if (!options.threshold) throw new RangeError('The threshold test needs a limit')
  return options.threshold
}

function distribution(test: DistributionTest): TestHandler<TestCountsMap[DistributionTest]> {
  return {
    count: (records, sign) => countDistribution(test, records, sign),
    run: (counts, sign, options) => (options.ranking ? rankingOutcome(test, counts, sign) : runDistributionTest(test, counts, sign)),
  }
}

const HANDLERS: { [T in TestName]: TestHandler<TestCountsMap[T]> } = {
  'first-digit': distribution('first-digit'),
  'second-digit': distribution('second-digit'),
  'first-two-digits': distribution('first-two-digits'),
  'first-three-digits': distribution('first-three-digits'),
  'last-two-digits': distribution('last-two-digits'),
  'summation': { count: countSummation, run: runSummationTest },
  'duplicates': { count: countDuplicates, run: (counts, sign, options) => runDuplicatesTest(counts, sign, options.duplicatesShown) },
  'round-numbers': { count: countRound, run: runRoundNumbersTest },
  'threshold': {
    count: (records, sign, options) => countThreshold(records, sign, requireThreshold(options)),
    run: (counts, sign, options) => runThresholdTest(counts, sign, requireThreshold(options)),
  },
}

function evaluate<T extends TestName>(test: T, input: TestInput<T>, sign: SignFilter, options: Options, style: NumberStyle) {
  const handler = HANDLERS[test] as TestHandler<TestCountsMap[T]>
  if ('values' in input) {
    const records = recordsOf(input.values, input.style ?? style)
    return { outcome: handler.run(handler.count(records, sign, options), sign, options), profile: profileOf(records, sign) }
  }
  return { outcome: handler.run(input.counts, sign, options), profile: input.profile ?? null }
}

/**
 * Runs one digit test — from cell values or from the server's counts, with identical results —
 * and returns the API's plain result: bins with their 95% ranges and Z, chi-square, MAD with
 * conformity, KS and the mantissa arc where they apply (null where not), the suitability findings,
 * and a ranking of groups when asked. A digit test is a screen, not proof: a deviation marks
 * where to look, never a finding of wrongdoing.
 */
export function runDigitTest<T extends TestName>(request: DigitTestRequest<T>): TestResult {
  const { test, input } = request
  const sign = request.sign ?? 'positive'
  const options: Options = { threshold: request.threshold, duplicatesShown: request.duplicatesShown ?? DEFAULT_DUPLICATES_SHOWN, ranking: false }
  const style = 'values' in input ? input.style ?? detectNumberStyle(input.values) : DOT_STYLE
  const { outcome, profile } = evaluate(test, input, sign, options, style)
  const result: TestResult = {
    test,
    column: request.column ?? null,
    sign,
    ...outcome,
    suitability: checkSuitability({ test, n: outcome.n, profile, bins: outcome.bins }),
    caution: CAUTION,
  }
  if (request.groups) {
    if (!isGroupable(test)) throw new RangeError(`The ${test} test does not rank groups`)
    const minSize = request.groups.minSize ?? MINIMUM_VALUES[test]!.stop
    // Bins, their ranges, KS and the arc of every group would be most of a grouped test's time, unread by the ranking.
    const ranking = { ...options, ranking: true }
    const outcomes = request.groups.items.map(item => ({ key: item.key, outcome: evaluate(test, item.input, sign, ranking, style).outcome }))
    const ranked = rankGroups(test as GroupableTest, outcomes, minSize)
    result.groups = ranked.groups
    result.groupsSkipped = ranked.skipped
  }
  return result
}
