import { cochranMinimum } from './cochran'
import type { Conformity, DistributionTest, Mad, Reading } from './types'

/**
 * Upper ends of close, acceptable and marginally acceptable conformity (Nigrini 2012, "Benford's
 * Law", Wiley, Table 7.1; from memory, as listed in docs/check-values.md). Tests without published
 * ranges have none.
 */
export const MAD_RANGES: Partial<Record<DistributionTest, readonly [number, number, number]>> = {
  'first-digit': [0.006, 0.012, 0.015],
  'second-digit': [0.008, 0.010, 0.012],
  'first-two-digits': [0.0012, 0.0018, 0.0022],
  'first-three-digits': [0.00036, 0.00044, 0.00050],
}

/**
 * The sizes from which the published ranges are read. The ranges were drawn for large samples:
 * a sample that follows the law exactly has a MAD of about 0.2348/√n in the first-digit test,
 * above the nonconformity cut-off below ~245 values. From these sizes on, such a sample's MAD
 * falls in the close range at least 99% of the time (Mantissa's seeded simulation, checked in
 * tests/unit/digits/readings.test.ts), so a named range says something about the data and not
 * about the sample size.
 */
export const MAD_RANGES_FROM: Partial<Record<DistributionTest, number>> = {
  'first-digit': 5000,
  'second-digit': 3000,
  'first-two-digits': 7000,
  'first-three-digits': 12000,
}

/**
 * The chance level of a single test's reading: a departure counts as more than chance at p < 0.01.
 * Stricter than the usual 5% because a reading is quoted; on data that follow the law it reads
 * "deviates" about 1 time in 100. A grouped table uses q < 0.05 instead (false discovery rate).
 */
export const READING_LEVEL = 0.01
export const GROUP_LEVEL = 0.05

const LEVELS: readonly Conformity[] = ['close', 'acceptable', 'marginal']
const CONFORMITIES = new Set<Reading>([...LEVELS, 'nonconforming'])

/**
 * Each range includes its upper end: a MAD of exactly 0.006 in the first-digit test is close
 * conformity. The MAD is rounded to 12 decimals first so that float noise in the sum cannot push
 * a value on a boundary into the next range.
 */
export function conformityOf(test: DistributionTest, mad: number): Conformity | null {
  const ranges = MAD_RANGES[test]
  if (!ranges) return null
  const value = Math.round(mad * 1e12) / 1e12
  const level = ranges.findIndex(upper => value <= upper)
  return level < 0 ? 'nonconforming' : LEVELS[level]!
}

export interface ReadingInput {
  test: DistributionTest
  n: number
  mad: number
  expectedShares: readonly number[]
  /** The chance test: chi-square p for one result, its Benjamini–Hochberg q in a grouped table. */
  p: number
  level: number
}

/**
 * The n-aware reading of a MAD. Below the test's minimum (Cochran's rule for the expected counts)
 * there is no verdict. Below MAD_RANGES_FROM the published ranges say more about n than
 * about the data, so the reading only says whether the departure is more than chance explains
 * (the chi-square test at `level`). From that size on the published range is read, except that
 * "nonconforming" also needs the chance test to agree, so a reading never contradicts its p or q.
 */
export function readingOf({ test, n, mad, expectedShares, p, level }: ReadingInput): Reading {
  if (n < cochranMinimum(expectedShares)) return 'too-few'
  const beyondChance = p < level
  const from = MAD_RANGES_FROM[test]
  const named = from !== undefined && n >= from ? conformityOf(test, mad) : null
  if (named === null) return beyondChance ? 'deviates' : 'chance'
  return named === 'nonconforming' && !beyondChance ? 'chance' : named
}

/** The published range behind a reading, or null when the reading is not one. */
export function conformityOfReading(reading: Reading | null): Conformity | null {
  return reading !== null && CONFORMITIES.has(reading) ? reading as Conformity : null
}

/** Mean absolute deviation of shares from expected shares. */
export function meanAbsoluteDeviation(shares: readonly number[], expectedShares: readonly number[]): number {
  let total = 0
  shares.forEach((share, i) => {
    total += Math.abs(share - expectedShares[i]!)
  })
  return total / shares.length
}

/**
 * The MAD a conforming sample of size n shows on average, from the normal approximation of each
 * bin: (1/K) Σ sqrt(2 p(1 − p) / (π n)); first digit ≈ 0.2348/√n.
 */
export function expectedMad(n: number, expectedShares: readonly number[]): number {
  if (n === 0) return 0
  let total = 0
  for (const p of expectedShares) total += Math.sqrt(2 * p * (1 - p) / (Math.PI * n))
  return total / expectedShares.length
}

/**
 * MAD with its n-aware reading, the MAD expected at this n and the excess over it
 * (Barney & Schulzke 2016, Journal of Forensic Accounting Research 1(1)). `p` is the test's
 * chi-square p, the chance test of the reading.
 */
export function madOf(test: DistributionTest, n: number, shares: readonly number[], expectedShares: readonly number[], p: number): Mad {
  const value = meanAbsoluteDeviation(shares, expectedShares)
  const expected = expectedMad(n, expectedShares)
  const reading = readingOf({ test, n, mad: value, expectedShares, p, level: READING_LEVEL })
  return { value, conformity: conformityOfReading(reading), expected, excess: value - expected, reading }
}
