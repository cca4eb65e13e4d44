import { benjaminiHochberg } from './false-discovery'
import type { TestOutcome } from './outcome'
import type { GroupResult } from './types'

export interface GroupOutcome {
  key: string
  outcome: TestOutcome
}

/**
 * Ranks groups (vendors, departments, years) by excess MAD, then MAD, after leaving out those
 * with fewer than `minSize` values. Each group keeps its chi-square p; q is the Benjamini–Hochberg
 * q-value over the groups ranked, which is what to read when many groups are compared at once.
 */
export function rankGroups(groups: readonly GroupOutcome[], minSize: number): { groups: GroupResult[], skipped: number } {
  const kept = groups.filter(group => group.outcome.n >= minSize && group.outcome.n > 0)
  const ranked: GroupResult[] = kept.map(({ key, outcome }) => ({
    key,
    n: outcome.n,
    mad: outcome.mad?.value ?? null,
    expectedMad: outcome.mad?.expected ?? null,
    excessMad: outcome.mad?.excess ?? null,
    conformity: outcome.mad?.conformity ?? null,
    p: outcome.chiSquare?.p ?? null,
    q: null,
  }))
  const tested = ranked.filter(group => group.p !== null)
  benjaminiHochberg(tested.map(group => group.p!)).forEach((q, i) => {
    tested[i]!.q = q
  })
  ranked.sort((a, b) => byDescending(a.excessMad, b.excessMad) || byDescending(a.mad, b.mad) || a.key.localeCompare(b.key))
  return { groups: ranked, skipped: groups.length - kept.length }
}

/** Larger first, missing values last. */
function byDescending(a: number | null, b: number | null): number {
  if (a === b) return 0
  if (a === null) return 1
  if (b === null) return -1
  return b - a
}
