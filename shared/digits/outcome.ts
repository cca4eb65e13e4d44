import type { Excluded, SignFilter, StatusCounts, TestResult } from './types'

/** What one test works out; the entry point adds the request's labels and the suitability findings. */
export type TestOutcome = Pick<TestResult, 'n' | 'excluded' | 'bins' | 'chiSquare' | 'mad' | 'ks' | 'arc' | 'duplicates' | 'threshold' | 'binsOutside'>

export const NO_STATISTICS = { chiSquare: null, mad: null, ks: null, arc: null, duplicates: null, threshold: null, binsOutside: null } as const

/** Values of the tested sign. */
export function signCount(status: StatusCounts, sign: SignFilter): number {
  return sign === 'positive' ? status.positive : status.negative
}

export function excludedOf(status: StatusCounts, sign: SignFilter, belowMinimum: number): Excluded {
  return {
    blank: status.blank,
    unreadable: status.unreadable,
    zero: status.zero,
    negative: sign === 'positive' ? status.negative : 0,
    positive: sign === 'negative' ? status.positive : 0,
    belowMinimum,
  }
}

/**
 * Counts handed in by the server must add up to the values of the tested sign; a mismatch means
 * the count queries used different filters, and any statistic built on them would be wrong.
 */
export function assertCountsAddUp(counted: number, status: StatusCounts, sign: SignFilter): void {
  const expected = signCount(status, sign)
  if (counted !== expected) {
    throw new RangeError(`Counts add up to ${counted}, but there are ${expected} ${sign} values`)
  }
}
