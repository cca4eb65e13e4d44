/**
 * What Benford's law (Benford 1938; Hill 1995, Statistical Science 10(4)) expects in each bin.
 * Log1p keeps precision for the small shares of the first-three-digit bins.
 */

/** Share of leading digit groups n = from..to: log10(1 + 1/n). */
export function leadingShares(from: number, to: number): number[] {
  const shares: number[] = []
  for (let n = from; n <= to; n++) shares.push(Math.log1p(1 / n) / Math.LN10)
  return shares
}

/** Share of second digits k = 0..9: Σ over d = 1..9 of log10(1 + 1/(10d + k)). */
export function secondDigitShares(): number[] {
  const shares: number[] = []
  for (let k = 0; k <= 9; k++) {
    let share = 0
    for (let d = 1; d <= 9; d++) share += Math.log1p(1 / (10 * d + k)) / Math.LN10
    shares.push(share)
  }
  return shares
}

/** Last two digits of the integer part: uniform, 1/100 each (common practice). */
export function lastTwoShares(): number[] {
  return Array.from({ length: 100 }, () => 0.01)
}

/**
 * Chance that a whole number of `integerDigits` digits, recorded to `fractionDigits` decimal places,
 * is a multiple of 10^zeros under the law: the first integerDigits + fractionDigits digits follow
 * log10(1 + 1/M), and the last zeros + fractionDigits of them must be 0. The sum runs over the
 * (integerDigits − zeros)-digit prefixes m of log10(1 + 1/(m·10^(zeros + fractionDigits))).
 * The sum tends to 10^-(zeros + fractionDigits) and its distance from that limit shrinks tenfold
 * with each extra prefix digit, so past four prefix digits the four-digit distance is scaled down
 * (within 1e-8 relative of the full sum).
 */
export function roundShare(integerDigits: number, zeros: number, fractionDigits: number): number {
  const prefixDigits = integerDigits - zeros
  if (prefixDigits < 1) return 0
  const summed = Math.min(prefixDigits, EXACT_PREFIX_DIGITS)
  const limit = 10 ** -(zeros + fractionDigits)
  const exact = prefixSum(summed, zeros + fractionDigits)
  return summed === prefixDigits ? exact : limit + (exact - limit) * 10 ** (summed - prefixDigits)
}

const EXACT_PREFIX_DIGITS = 4
const prefixSumCache = new Map<string, number>()

function prefixSum(prefixDigits: number, shift: number): number {
  const cacheKey = `${prefixDigits}:${shift}`
  const cached = prefixSumCache.get(cacheKey)
  if (cached !== undefined) return cached
  const scale = 10 ** shift
  let share = 0
  for (let m = 10 ** (prefixDigits - 1); m < 10 ** prefixDigits; m++) share += Math.log1p(1 / (m * scale)) / Math.LN10
  prefixSumCache.set(cacheKey, share)
  return share
}
