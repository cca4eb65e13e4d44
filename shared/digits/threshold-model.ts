import { studentUpper } from './tails'

/** One bucket's prediction from the trend through the others, with its scatter. */
export interface Prediction {
  /** The count the trend predicts. */
  expected: number
  /** Standard error of a new count there: the bucket's own scatter plus the trend's uncertainty. */
  se: number
}

export interface TrendModel {
  /** The fitted trend at every bucket (never below 0). */
  fitted: number[]
  /** Pearson dispersion of the fitting buckets around the trend, at least 1 (Poisson). */
  dispersion: number
  /** Degrees of freedom left for the dispersion: fitting buckets less the line's two parameters. */
  df: number
  predict: (x: number) => Prediction
}

/**
 * A straight line through the buckets at `fitting` (ordinary least squares), with a quasi-Poisson
 * scatter model (McCullagh & Nelder 1989, Generalized Linear Models, §4.5): counts vary around
 * the line with variance φ·μ, φ estimated from the fitting buckets' Pearson residuals,
 * φ = Σ (y − μ)² / μ / (m − 2), and never taken below 1, the Poisson case. Counts near a limit
 * scatter far more than Poisson around any smooth trend (prices, habits, rounding), and a
 * prediction that ignores it finds "bunching" in every column.
 *
 * The prediction for a new count at x adds the line's own uncertainty there: the line is linear in
 * the counts, μ̂(x) = Σ wᵢ(x) yᵢ with wᵢ(x) = 1/m + (x − x̄)(xᵢ − x̄)/Sxx, so Var μ̂(x) = Σ wᵢ(x)² φ μᵢ.
 */
export function trendThrough(counts: readonly number[], fitting: readonly number[]): TrendModel {
  const m = fitting.length
  const meanX = fitting.reduce((s, x) => s + x, 0) / m
  const meanY = fitting.reduce((s, x) => s + counts[x]!, 0) / m
  const sxx = fitting.reduce((s, x) => s + (x - meanX) ** 2, 0)
  const slope = fitting.reduce((s, x) => s + (x - meanX) * (counts[x]! - meanY), 0) / sxx
  const line = (x: number) => Math.max(0, meanY + slope * (x - meanX))
  const fitted = counts.map((_, x) => line(x))
  const df = m - 2
  // A trend of 0 would divide by 0; half a count is the smallest mean a bucket is given.
  const mean = (x: number) => Math.max(0.5, fitted[x]!)
  const pearson = fitting.reduce((s, x) => s + (counts[x]! - mean(x)) ** 2 / mean(x), 0) / df
  const dispersion = Math.max(1, pearson)
  const predict = (x: number): Prediction => {
    const lineVariance = fitting.reduce((s, xi) => s + (1 / m + ((x - meanX) * (xi - meanX)) / sxx) ** 2 * dispersion * mean(xi), 0)
    return { expected: fitted[x]!, se: Math.sqrt(dispersion * mean(x) + lineVariance) }
  }
  return { fitted, dispersion, df, predict }
}

/**
 * Student's t quantile for a two-sided 95% interval at df degrees of freedom (2.447 at df 6;
 * printed t tables), by bisection on the upper tail: monotone, and 60 halvings reach full precision.
 */
export function t95(df: number): number {
  let low = 0
  let high = 100
  for (let i = 0; i < 60; i++) {
    const middle = (low + high) / 2
    if (studentUpper(middle, df) > 0.025) low = middle
    else high = middle
  }
  return (low + high) / 2
}

/**
 * How often a count at least `observed` appears where the trend predicts `prediction` and no limit
 * acts, under the model: the upper tail of Student's t with the dispersion's degrees of freedom
 * (the dispersion is estimated, so the normal would be too sure).
 */
export function excessP(observed: number, prediction: Prediction, df: number): number {
  return studentUpper((observed - prediction.expected) / prediction.se, df)
}
