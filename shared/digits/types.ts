/**
 * Plain data shapes that cross the boundary between the digit engine, the server and the page.
 * Everything here is JSON-safe except where a comment says otherwise.
 */

export const TEST_NAMES = [
  'first-digit',
  'second-digit',
  'first-two-digits',
  'first-three-digits',
  'last-two-digits',
  'summation',
  'duplicates',
  'round-numbers',
  'threshold',
] as const

export type TestName = typeof TEST_NAMES[number]

/** The tests that compare a digit distribution with a fixed expected one. */
export type DistributionTest = 'first-digit' | 'second-digit' | 'first-two-digits' | 'first-three-digits' | 'last-two-digits'

/** The tests that can rank groups: they have a MAD (and, except summation, a chi-square p). */
export const GROUPABLE_TESTS = ['first-digit', 'second-digit', 'first-two-digits', 'first-three-digits', 'last-two-digits', 'summation'] as const satisfies readonly TestName[]

export type GroupableTest = typeof GROUPABLE_TESTS[number]

export function isGroupable(test: TestName): test is GroupableTest {
  return (GROUPABLE_TESTS as readonly TestName[]).includes(test)
}

export type SignFilter = 'positive' | 'negative'

export type CellStatus = 'blank' | 'unreadable' | 'zero' | 'number'

/** How a column writes its numbers; decided once per column, never per cell. */
export interface NumberStyle {
  decimalMark: '.' | ','
}

/**
 * One cell's value, stored once at import (one row per value) and counted later with GROUP BY.
 * Digit fields are null when the value has no such digit under the test's rule.
 */
export interface DigitRecord {
  status: CellStatus
  /** -1, 0 (blank, unreadable, zero) or 1. */
  sign: -1 | 0 | 1
  /** Exact signed decimal text without exponent or trailing fractional zeros, fit for a NUMERIC column. */
  value: string | null
  /** 1–9. */
  firstDigit: number | null
  /** 0–9; a value with one significant digit has second digit 0 (5 = 5.0). */
  secondDigit: number | null
  /** 10–99, only when |value| ≥ 10. */
  firstTwo: number | null
  /** 100–999, only when |value| ≥ 100. */
  firstThree: number | null
  /** 0–99: the integer part modulo 100, only when |value| ≥ 10. */
  lastTwo: number | null
  /** Digits before the decimal mark; 0 when |value| < 1. */
  integerDigits: number
  /** Zeros at the end of the integer part; 0 when |value| < 1. */
  trailingZeros: number
  /** Decimal places left after dropping trailing zeros (12.50 has 1). */
  fractionDigits: number
  /** frac(log10 |value|) in [0, 1), from the significant digits. */
  mantissa: number | null
}

/** Counts of cells by status and sign: SELECT status, sign, count(*) FROM records GROUP BY status, sign. */
export interface StatusCounts {
  blank: number
  unreadable: number
  zero: number
  positive: number
  negative: number
}

/**
 * One row of a GROUP BY over a digit-record field; key null holds the values below the test's minimum.
 * Counts are numbers: cast count(*) to int in SQL, as pg returns bigint as text.
 */
export interface KeyCount {
  key: number | string | null
  count: number
}

/** Sums over the tested values: SUM(cos(2*pi()*mantissa)), SUM(sin(2*pi()*mantissa)). */
export interface ArcSums {
  cos: number
  sin: number
}

/**
 * Counts for a distribution test. SQL shape (first-two-digits shown; the field follows the test):
 *   SELECT first_two AS key, count(*) AS count, sum(cos(2*pi()*mantissa)) AS cos, sum(sin(2*pi()*mantissa)) AS sin
 *   FROM digit_records WHERE <column> AND status = 'number' AND sign = 1 GROUP BY first_two
 * The NULL-key row is the count below the test's minimum and is left out of the arc sums.
 */
export interface DistributionCounts {
  status: StatusCounts
  keys: KeyCount[]
  /** Needed for the mantissa arc of the first-digit family; the arc is null without it. */
  arc?: ArcSums
}

/**
 * SQL: SELECT first_two AS key, count(*) AS count, sum(abs(value)) AS amount
 *      FROM digit_records WHERE … AND status = 'number' AND sign = 1 GROUP BY first_two
 */
export interface SummationCounts {
  status: StatusCounts
  keys: Array<KeyCount & { amount: string | number }>
}

/**
 * SQL: SELECT value, count(*) FROM digit_records WHERE … AND status = 'number' AND sign = 1
 *      GROUP BY value HAVING count(*) > 1 ORDER BY count(*) DESC, value LIMIT $top
 * plus one pass over the same groups for `distinct` and `repeated`:
 *   SELECT count(*), count(*) FILTER (WHERE c > 1), coalesce(sum(c) FILTER (WHERE c > 1), 0)
 *   FROM (SELECT count(*) AS c FROM … GROUP BY value) g
 */
export interface DuplicateCounts {
  status: StatusCounts
  distinct: number
  repeated: { values: number, rows: number }
  top: Array<{ value: string, count: number }>
}

/**
 * SQL: SELECT integer_digits, trailing_zeros, fraction_digits, count(*) FROM digit_records
 *      WHERE … AND status = 'number' AND sign = 1 GROUP BY 1, 2, 3
 */
export interface RoundCounts {
  status: StatusCounts
  cells: Array<{ integerDigits: number, trailingZeros: number, fractionDigits: number, count: number }>
}

/**
 * Ten equal buckets of width w around the limit L, from L − 5w to L + 5w (exact NUMERIC arithmetic):
 *   SELECT floor((abs(value) - $low) / $width)::int AS bucket, count(*) FROM digit_records
 *   WHERE … AND status = 'number' AND sign = 1 AND abs(value) >= $low AND abs(value) < $high GROUP BY 1
 * `thresholdBand()` works out $low, $width and $high; `decimalToText()` writes them for the query.
 */
export interface ThresholdCounts {
  status: StatusCounts
  buckets: Array<{ bucket: number, count: number }>
}

export interface TestCountsMap {
  'first-digit': DistributionCounts
  'second-digit': DistributionCounts
  'first-two-digits': DistributionCounts
  'first-three-digits': DistributionCounts
  'last-two-digits': DistributionCounts
  'summation': SummationCounts
  'duplicates': DuplicateCounts
  'round-numbers': RoundCounts
  'threshold': ThresholdCounts
}

export interface ThresholdOptions {
  /** The limit amounts may be kept under, e.g. an approval limit; decimal text or number. */
  limit: string | number
  /** Bucket width; default a twentieth of the limit. At most a fifth of it. */
  width?: string | number
}

/**
 * Column facts the server gets cheaply from SQL over the tested sign's numbers:
 *   SELECT count(*), min(abs(value)), max(abs(value)),
 *          count(*) FILTER (WHERE fraction_digits = 0),
 *          count(*) FILTER (WHERE fraction_digits = 0 AND trailing_zeros >= 2)
 * plus count(*) at the min and at the max, and the largest count of
 * GROUP BY integer_digits and of GROUP BY value.
 */
export interface ColumnProfile {
  n: number
  /** Smallest and largest absolute value, decimal text. */
  min: string
  max: string
  atMin: number
  atMax: number
  /** Values without a fractional part. */
  whole: number
  /** Whole values that are multiples of 100. */
  roundHundreds: number
  /** Values sharing the most common count of integer digits. */
  commonLength: number
  /** How often the most frequent value occurs. */
  topValue: number
}

export type Severity = 'info' | 'warning' | 'stop'

export interface Finding {
  code: string
  severity: Severity
  message: string
}

export type Conformity = 'close' | 'acceptable' | 'marginal' | 'nonconforming'

/**
 * What a MAD may be read as at its sample size (see mad.ts): too few values to read; within what
 * chance gives at this size; departing by more than chance explains at this size (below the size
 * where the published ranges apply); or, from that size on, one of the published ranges.
 */
export type Reading = 'too-few' | 'chance' | 'deviates' | Conformity

export interface Bin {
  key: string
  count: number
  /** Share of n; for summation, share of the total amount. */
  share: number
  /** Expected count at this n under the test's law (null where the test has none). */
  expected: number | null
  expectedShare: number | null
  /** The binomial 95% range of counts a conforming sample of this n shows. */
  low: number | null
  high: number | null
  /** Signed Z with continuity correction: positive when the count is above the expectation. */
  z: number | null
  /** Summation only: the bucket's absolute amount, exact decimal text. */
  amount: string | null
}

export interface Excluded {
  blank: number
  unreadable: number
  zero: number
  /** Negative values left out of a test of positives. */
  negative: number
  /** Positive values left out of a test of negatives. */
  positive: number
  /** Values of the tested sign outside the test's range (under 10, under 100, outside the threshold band). */
  belowMinimum: number
}

export interface ChiSquare { statistic: number, df: number, p: number }
/**
 * `expected` is the MAD a conforming sample of this n shows on average; null where no formula applies (summation).
 * `conformity` is a published range only where the sample is large enough for it to mean what it says
 * (MAD_RANGES_FROM) and agrees with the chance test; `reading` is what every surface prints.
 */
export interface Mad { value: number, conformity: Conformity | null, expected: number | null, excess: number | null, reading: Reading | null }
export interface Ks { d: number, critical: number }
/** Mantissa arc (Rayleigh): squared mean resultant length and its approximate p. */
export interface Arc { l2: number, p: number }

/**
 * How many bins fall outside their 95% range, and how many would on average if the data followed
 * the test's expectation exactly (each range covers at least 95%, so fewer than 5% of the bins).
 */
export interface BinsOutside { count: number, expected: number }

export interface DuplicatesSummary { distinct: number, repeatedValues: number, repeatedRows: number }

export interface ThresholdSummary {
  limit: string
  width: string
  /** Counts in [L − w, L) and [L, L + w). */
  below: number
  above: number
  /** What a straight line through the other eight buckets predicts for those two. */
  expectedBelow: number
  expectedAbove: number
  /** below − expectedBelow, with its 95% interval from the prediction's scatter (Student's t, 6 df). */
  excess: number
  excessLow: number
  excessHigh: number
  /** How much more the eight outer buckets scatter around the line than Poisson counts would (at least 1). */
  dispersion: number
  /**
   * How often an excess at least this large appears where no limit acts, under the stated model:
   * the line plus quasi-Poisson scatter estimated from the outer buckets. Not the chance that the
   * bunching is innocent.
   */
  pBunching: number
  /** The same for the share of the two windows' values that falls under the limit (quasi-binomial). */
  pSplit: number
}

export interface GroupResult {
  key: string
  n: number
  mad: number | null
  expectedMad: number | null
  excessMad: number | null
  conformity: Conformity | null
  /** Read with q (not p) as the chance test, so that it never contradicts the table's q. */
  reading: Reading | null
  p: number | null
  q: number | null
}

export interface TestResult {
  test: TestName
  column: string | null
  sign: SignFilter
  n: number
  excluded: Excluded
  bins: Bin[]
  chiSquare: ChiSquare | null
  mad: Mad | null
  ks: Ks | null
  arc: Arc | null
  duplicates: DuplicatesSummary | null
  threshold: ThresholdSummary | null
  /** Null where the bins have no range (summation, duplicates). */
  binsOutside: BinsOutside | null
  suitability: Finding[]
  groups?: GroupResult[]
  /** Groups left out for having fewer values than the minimum. */
  groupsSkipped?: number
  /** Plain words every surface shows beside the numbers. */
  caution: string
}
