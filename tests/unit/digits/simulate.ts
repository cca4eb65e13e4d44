import type { DistributionCounts } from '#shared/digits'

/** The demo's seeded generator (mulberry32): every simulated sample is the same on every run and machine. */
export { seededRandom as seeded } from '../../../server/services/demo/seeded-random'

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
