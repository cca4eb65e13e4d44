import type { DistributionCounts } from '../../../shared/digits/types'

/**
 * A small seeded generator (mulberry32, Tommy Ettinger's public-domain 32-bit generator), so that
 * every simulated sample in the suite is the same on every run and machine.
 */
export function seeded(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6D2B79F5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** n draws from the expected shares (a multinomial sample that follows the law by construction), as bin counts. */
export function sampleCounts(random: () => number, shares: readonly number[], n: number): number[] {
  const cumulative: number[] = []
  let total = 0
  for (const share of shares) cumulative.push((total += share))
  const counts = shares.map(() => 0)
  for (let i = 0; i < n; i++) {
    const u = random() * total
    let low = 0
    let high = cumulative.length - 1
    while (low < high) {
      const middle = (low + high) >> 1
      if (cumulative[middle]! < u) low = middle + 1
      else high = middle
    }
    counts[low]!++
  }
  return counts
}

/** Bin counts as the server's GROUP BY hands them to the engine. */
export function asCounts(keys: readonly string[], counts: readonly number[]): DistributionCounts {
  const n = counts.reduce((a, b) => a + b, 0)
  return { status: { blank: 0, unreadable: 0, zero: 0, positive: n, negative: 0 }, keys: keys.map((key, i) => ({ key, count: counts[i]! })) }
}

/**
 * Amounts whose log10 is uniform over [from, to) decades, written with two decimals: they follow
 * Benford's law (for whole decades), and their endings are near uniform.
 */
export function logUniform(random: () => number, n: number, from = 1, to = 6): string[] {
  return Array.from({ length: n }, () => (10 ** (from + (to - from) * random())).toFixed(2))
}
