import { toDigitRecord } from './digit-record'

/*
 * Series that are known to follow Benford's law (a^n for a not a power of 10, Fibonacci) or known
 * not to (n^k), built with exact integer arithmetic for calibration charts. Values are decimal text.
 */

/** a^from, a^(from+1), …, `count` terms. */
export function powerSeries(base: number | bigint, count: number, from = 0): string[] {
  const a = BigInt(base)
  const values: string[] = []
  let value = a ** BigInt(from)
  for (let i = 0; i < count; i++) {
    values.push(value.toString())
    value *= a
  }
  return values
}

/** F1, F2, …, F_count with F1 = F2 = 1. */
export function fibonacciSeries(count: number): string[] {
  const values: string[] = []
  let [current, next] = [1n, 1n]
  for (let i = 0; i < count; i++) {
    values.push(current.toString())
    ;[current, next] = [next, current + next]
  }
  return values
}

/** 1^k, 2^k, …, count^k. */
export function integerPowerSeries(exponent: number, count: number): string[] {
  const k = BigInt(exponent)
  return Array.from({ length: count }, (_, i) => (BigInt(i + 1) ** k).toString())
}

/** How many values start with 1, 2, …, 9. */
export function firstDigitCounts(values: readonly string[]): number[] {
  const counts = Array.from({ length: 9 }, () => 0)
  for (const value of values) {
    const digit = toDigitRecord(value).firstDigit
    if (digit !== null) counts[digit - 1]!++
  }
  return counts
}
