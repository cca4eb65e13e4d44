/**
 * Smallest sample at which a chi-square test over bins with these expected shares can be trusted,
 * by Cochran's rule (Cochran 1954, Biometrics 10(4)): no bin expecting fewer than 1 value and no
 * more than 20% of the bins expecting fewer than 5. Below it Mantissa reads no verdict. (The
 * stricter "at least 5 in every bin" is a common simplification of the same rule.)
 */
export function cochranMinimum(shares: readonly number[]): number {
  let minimum = minimums.get(shares)
  if (minimum === undefined) minimums.set(shares, minimum = cochranOf(shares))
  return minimum
}

/** Per array of shares (a test's own, read for every group): worked out once. */
const minimums = new WeakMap<readonly number[], number>()

function cochranOf(shares: readonly number[]): number {
  const ascending = [...shares].sort((a, b) => a - b)
  const allowedUnderFive = Math.floor(0.2 * shares.length)
  return Math.max(Math.ceil(1 / ascending[0]!), Math.ceil(5 / ascending[allowedUnderFive]!))
}
