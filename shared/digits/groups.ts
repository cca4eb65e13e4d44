import { benjaminiHochberg } from './false-discovery'
import { DISTRIBUTIONS } from './distribution-tests'
import { conformityOfReading, GROUP_LEVEL, readingOf } from './mad'
import type { TestOutcome } from './outcome'
import type { GroupableTest, GroupResult } from './types'

export interface GroupOutcome {
  key: string
  outcome: TestOutcome
}

/**
 * Ranks groups (vendors, departments, years) after leaving out those with fewer than `minSize`
 * values. Each group keeps its chi-square p; q is the Benjamini–Hochberg q-value over the groups
 * ranked, which is what to read when many groups are compared at once, and each group's reading
 * uses q as its chance test so that the table never contradicts itself.
 *
 * The order must not favour small groups: their MAD and excess MAD scatter more by chance alone
 * (the MAD of a conforming sample shrinks like 1/√n), so ranking by them puts noise on top.
 * Distribution tests rank by p, which is uniform under the law at every size; summation, which has
 * no p, ranks by MAD·√n, which a sample whose amounts spread alike keeps at the same level at every
 * size. Groups too small to read sort after those that can be read.
 */
export function rankGroups(test: GroupableTest, groups: readonly GroupOutcome[], minSize: number): { groups: GroupResult[], skipped: number } {
  const kept = groups.filter(group => group.outcome.n >= minSize && group.outcome.n > 0)
  const ranked: GroupResult[] = kept.map(({ key, outcome }) => ({
    key,
    n: outcome.n,
    mad: outcome.mad?.value ?? null,
    expectedMad: outcome.mad?.expected ?? null,
    excessMad: outcome.mad?.excess ?? null,
    conformity: null,
    reading: outcome.mad?.reading ?? null,
    p: outcome.chiSquare?.p ?? null,
    q: null,
  }))
  const tested = ranked.filter(group => group.p !== null)
  benjaminiHochberg(tested.map(group => group.p!)).forEach((q, i) => {
    tested[i]!.q = q
  })
  if (test !== 'summation') {
    for (const group of tested) {
      group.reading = readingOf({ test, n: group.n, mad: group.mad!, expectedShares: DISTRIBUTIONS[test].shares, p: group.q!, level: GROUP_LEVEL })
      group.conformity = conformityOfReading(group.reading)
    }
  }
  const score = (group: GroupResult) => (test === 'summation' ? -(group.mad ?? 0) * Math.sqrt(group.n) : group.p ?? 1)
  ranked.sort((a, b) => Number(a.reading === 'too-few') - Number(b.reading === 'too-few') || score(a) - score(b) || b.n - a.n || a.key.localeCompare(b.key))
  return { groups: ranked, skipped: groups.length - kept.length }
}
