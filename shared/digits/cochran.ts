/**
 * Smallest sample at which the rarest bin expects at least 5 values, the usual condition for
 * trusting a chi-square test (Cochran 1954; common practice). Below it Mantissa reads no verdict.
 */
export function cochranMinimum(rarestShare: number): number {
  return Math.ceil(5 / rarestShare)
}
