import { addDecimal, DECIMAL_ZERO, decimalToNumber, decimalToText, toDecimal, type Decimal } from './decimal'
import { DISTRIBUTIONS } from './distribution-tests'
import { cochranMinimum } from './cochran'
import { meanAbsoluteDeviation } from './mad'
import { assertCountsAddUp, excludedOf, NO_STATISTICS, type TestOutcome } from './outcome'
import type { Bin, SignFilter, SummationCounts } from './types'

const KEYS = DISTRIBUTIONS['first-two-digits'].keys
const EXPECTED_SHARE = 1 / KEYS.length

/**
 * Summation test: under the law every first-two-digit bucket (values ≥ 10) holds the same share,
 * 1/90, of the total absolute amount. A bucket far above it points to a few large amounts or many
 * copies of one. Amounts are summed exactly; bins carry the amount and its share, and the MAD is
 * taken over amount shares (no published conformity ranges, so conformity is null).
 */
export function runSummationTest(counts: SummationCounts, sign: SignFilter): TestOutcome {
  const index = new Map(KEYS.map((key, i) => [key, i]))
  const binCounts = KEYS.map(() => 0)
  const amounts: Decimal[] = KEYS.map(() => DECIMAL_ZERO)
  let belowMinimum = 0
  for (const { key, count, amount } of counts.keys) {
    if (key === null) {
      belowMinimum += count
      continue
    }
    const i = index.get(String(key))
    if (i === undefined) throw new RangeError(`Key ${key} is not a first-two-digit bucket`)
    binCounts[i]! += count
    amounts[i] = addDecimal(amounts[i]!, toDecimal(amount))
  }
  const n = binCounts.reduce((a, b) => a + b, 0)
  assertCountsAddUp(n + belowMinimum, counts.status, sign)

  const total = decimalToNumber(amounts.reduce(addDecimal, DECIMAL_ZERO))
  const bins: Bin[] = KEYS.map((key, i) => ({
    key,
    count: binCounts[i]!,
    share: total > 0 ? decimalToNumber(amounts[i]!) / total : 0,
    expected: null,
    expectedShare: EXPECTED_SHARE,
    low: null,
    high: null,
    z: null,
    amount: decimalToText(amounts[i]!),
  }))
  const excluded = excludedOf(counts.status, sign, belowMinimum)
  if (n === 0) return { ...NO_STATISTICS, n, excluded, bins }
  const value = meanAbsoluteDeviation(bins.map(bin => bin.share), bins.map(() => EXPECTED_SHARE))
  // No published ranges and no chance model for amount shares: the only reading is "too few values".
  const reading = n < cochranMinimum(DISTRIBUTIONS['first-two-digits'].shares) ? 'too-few' : null
  return { ...NO_STATISTICS, n, excluded, bins, mad: { value, conformity: null, expected: null, excess: null, reading } }
}
