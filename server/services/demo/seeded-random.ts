/**
 * A small seeded generator (mulberry32), so invented data is the same on every machine: the demo
 * ledger, the tests' ledger fixture and the benchmarks' data (run through tsx) all draw from it.
 */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6D2B79F5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}
