import { buildBins } from './bin-statistics'
import {
  absDecimal, addDecimal, compareDecimal, decimalToText, floorDivideDecimal, multiplyDecimal, subtractDecimal, toDecimal,
  type Decimal,
} from './decimal'
import { excludedOf, NO_STATISTICS, signCount, type TestOutcome } from './outcome'
import { binomialAtLeast, poissonAtLeast } from './tails'
import type { SignFilter, ThresholdCounts, ThresholdOptions } from './types'

export const BUCKETS_EACH_SIDE = 5
const BELOW = BUCKETS_EACH_SIDE - 1
const ABOVE = BUCKETS_EACH_SIDE
const DEFAULT_WIDTH_SHARE = toDecimal('0.05')

export interface ThresholdBand {
  limit: Decimal
  width: Decimal
  /** The band runs from low (included) to high (excluded). */
  low: Decimal
  high: Decimal
}

/**
 * The ten buckets around a limit: width w (default L/20), from L − 5w to L + 5w, so that the
 * bucket just under the limit is [L − w, L). The server passes low, width and high to its SQL.
 */
export function thresholdBand(options: ThresholdOptions): ThresholdBand {
  const limit = toDecimal(options.limit)
  const width = options.width === undefined ? multiplyDecimal(limit, DEFAULT_WIDTH_SHARE) : toDecimal(options.width)
  const span = multiplyDecimal(width, toDecimal(BUCKETS_EACH_SIDE))
  const low = subtractDecimal(limit, span)
  if (width.units <= 0n || low.units < 0n) {
    throw new RangeError('The threshold needs a positive limit and a width of at most a fifth of it')
  }
  return { limit, width, low, high: addDecimal(limit, span) }
}

/** Bucket 0–9 of an absolute amount, or null outside the band; exact, like SQL on NUMERIC. */
export function thresholdBucket(band: ThresholdBand, value: Decimal): number | null {
  const amount = absDecimal(value)
  if (compareDecimal(amount, band.low) < 0 || compareDecimal(amount, band.high) >= 0) return null
  return floorDivideDecimal(subtractDecimal(amount, band.low), band.width)
}

/**
 * Threshold test: are amounts bunched just under a limit the user gives (an approval limit)?
 * Compares the bucket just under the limit with the one just over it, and both with a straight
 * line fitted through the other eight buckets (what a smooth distribution predicts there).
 * pBunching is the Poisson chance of at least the count under the limit given the line;
 * pSplit the binomial chance of at least that share of the two windows falling under the limit.
 * Values outside the band count as below the test's minimum.
 */
export function runThresholdTest(counts: ThresholdCounts, sign: SignFilter, options: ThresholdOptions): TestOutcome {
  const band = thresholdBand(options)
  const binCounts = Array.from({ length: 2 * BUCKETS_EACH_SIDE }, () => 0)
  for (const { bucket, count } of counts.buckets) {
    if (!Number.isInteger(bucket) || bucket < 0 || bucket >= binCounts.length) {
      throw new RangeError(`Bucket ${bucket} is outside the threshold band`)
    }
    binCounts[bucket]! += count
  }
  const n = binCounts.reduce((a, b) => a + b, 0)
  const outside = signCount(counts.status, sign) - n
  if (outside < 0) throw new RangeError('The threshold buckets hold more values than the column')

  const fitted = lineThroughOuterBuckets(binCounts)
  const keys = binCounts.map((_, i) => decimalToText(addDecimal(band.low, multiplyDecimal(band.width, toDecimal(i)))))
  const bins = buildBins(n, keys, binCounts, fitted.map(count => (n > 0 ? count / n : 0)))
  const below = binCounts[BELOW]!
  const above = binCounts[ABOVE]!
  const expectedBelow = fitted[BELOW]!
  const expectedAbove = fitted[ABOVE]!
  return {
    ...NO_STATISTICS,
    n,
    excluded: excludedOf(counts.status, sign, outside),
    bins,
    threshold: {
      limit: decimalToText(band.limit),
      width: decimalToText(band.width),
      below,
      above,
      expectedBelow,
      expectedAbove,
      pBunching: poissonAtLeast(below, expectedBelow),
      pSplit: splitAtLeast(below, above, expectedBelow, expectedAbove),
    },
  }
}

/** Least-squares line through the buckets other than the two beside the limit; never below 0. */
function lineThroughOuterBuckets(counts: readonly number[]): number[] {
  const points = counts.map((count, x) => ({ x, count })).filter(({ x }) => x !== BELOW && x !== ABOVE)
  const meanX = points.reduce((s, p) => s + p.x, 0) / points.length
  const meanY = points.reduce((s, p) => s + p.count, 0) / points.length
  const sxy = points.reduce((s, p) => s + (p.x - meanX) * (p.count - meanY), 0)
  const sxx = points.reduce((s, p) => s + (p.x - meanX) ** 2, 0)
  const slope = sxy / sxx
  return counts.map((_, x) => Math.max(0, meanY + slope * (x - meanX)))
}

function splitAtLeast(below: number, above: number, expectedBelow: number, expectedAbove: number): number {
  const m = below + above
  if (below === 0) return 1
  const p = expectedBelow + expectedAbove > 0 ? expectedBelow / (expectedBelow + expectedAbove) : 0.5
  return binomialAtLeast(below, m, p)
}
