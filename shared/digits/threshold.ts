import {
  absDecimal, addDecimal, compareDecimal, decimalToText, floorDivideDecimal, multiplyDecimal, subtractDecimal, toDecimal,
  type Decimal,
} from './decimal'
import { excludedOf, NO_STATISTICS, signCount, type TestOutcome } from './outcome'
import { P_FLOOR } from './p-floor'
import { studentUpper } from './tails'
import { excessP, t95, trendThrough, type TrendModel } from './threshold-model'
import type { Bin, SignFilter, ThresholdCounts, ThresholdOptions } from './types'

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
 * A straight line through the eight buckets away from the limit predicts the two beside it, with
 * the scatter those eight show around it (quasi-Poisson; see threshold-model.ts). The excess is
 * the count just under the limit less that prediction, with a 95% interval; pBunching is how often
 * an excess at least this large appears where no limit acts, under that model. pSplit asks the same
 * of the share of the two windows' values that falls under the limit. The two buckets beside the
 * limit carry their 95% prediction range; the eight others are the fit itself and carry none.
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

  const model = trendThrough(binCounts, binCounts.map((_, x) => x).filter(x => x !== BELOW && x !== ABOVE))
  const t = t95(model.df)
  const predictions = new Map([BELOW, ABOVE].map(x => [x, model.predict(x)]))
  const bins: Bin[] = binCounts.map((count, x) => {
    const prediction = predictions.get(x)
    return {
      key: decimalToText(addDecimal(band.low, multiplyDecimal(band.width, toDecimal(x)))),
      count,
      share: n > 0 ? count / n : 0,
      expected: model.fitted[x]!,
      expectedShare: n > 0 ? model.fitted[x]! / n : 0,
      low: prediction ? Math.max(0, Math.ceil(prediction.expected - t * prediction.se)) : null,
      high: prediction ? Math.floor(prediction.expected + t * prediction.se) : null,
      z: prediction ? (count - prediction.expected) / prediction.se : null,
      amount: null,
    }
  })
  const below = binCounts[BELOW]!
  const above = binCounts[ABOVE]!
  const under = predictions.get(BELOW)!
  const over = predictions.get(ABOVE)!
  const excess = below - under.expected
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
      expectedBelow: under.expected,
      expectedAbove: over.expected,
      excess,
      excessLow: excess - t * under.se,
      excessHigh: excess + t * under.se,
      dispersion: model.dispersion,
      pBunching: excessP(below, under, model.df),
      pSplit: splitP(below, above, under.expected, over.expected, model),
    },
  }
}

/**
 * The share of the two windows' values under the limit against the trend's split, with the
 * binomial variance inflated by the dispersion (quasi-binomial) and Student's t for its estimate.
 */
function splitP(below: number, above: number, expectedBelow: number, expectedAbove: number, model: TrendModel): number {
  const m = below + above
  if (m === 0) return 1
  const share = expectedBelow + expectedAbove > 0 ? expectedBelow / (expectedBelow + expectedAbove) : 0.5
  const spread = Math.sqrt(model.dispersion * m * share * (1 - share))
  if (spread === 0) return below > m * share ? P_FLOOR : 1
  return studentUpper((below - m * share) / spread, model.df)
}
