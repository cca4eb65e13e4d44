import type { ColumnProfile, DistributionCounts } from '#shared/digits'
import type { Grouped } from './count-merge'

type Answer = { groups: Grouped<DistributionCounts>, profile: Omit<ColumnProfile, 'topValue'> | null }

const keyCounts = (counts: DistributionCounts) => new Map(counts.keys.filter(k => k.count).map(k => [String(k.key), k.count]))

/**
 * Sums of cos and sin agree to rounding: memory keeps each term as float32 (column-records.ts), within
 * 2^-25 of SQL's double, and both add in another order; 1e-7 a term bounds both.
 */
const closeSums = (a = 0, b = 0, n = 1) => Math.abs(a - b) <= 1e-7 * Math.max(1, n)

/**
 * Throws (the request answers 500) unless the counts from memory equal SQL's for the same question:
 * every group's status and key counts exactly, its arc sums to rounding (for the tests that read the
 * arc: memory counts it for no other), and the suitability facts.
 * The column scan's "verify" mode (column-scan.ts) runs every test of the suite through it.
 */
export function assertSameCounts(memory: Answer, sql: Answer, arc: boolean) {
  const differences: string[] = []
  const sqlGroups = new Map([...sql.groups].map(([key, counts]) => [key ?? '', counts]))
  const memoryGroups = new Map([...memory.groups].map(([key, counts]) => [key ?? '', counts]))
  for (const key of new Set([...sqlGroups.keys(), ...memoryGroups.keys()])) {
    const [a, b] = [memoryGroups.get(key), sqlGroups.get(key)]
    if (!a || !b) {
      differences.push(`group "${key}" only ${a ? 'in memory' : 'in SQL'}`)
      continue
    }
    if (JSON.stringify(a.status) !== JSON.stringify(b.status)) differences.push(`group "${key}" status ${JSON.stringify(a.status)} ≠ ${JSON.stringify(b.status)}`)
    const [ka, kb] = [keyCounts(a), keyCounts(b)]
    for (const k of new Set([...ka.keys(), ...kb.keys()])) {
      if (ka.get(k) !== kb.get(k)) differences.push(`group "${key}" key ${k}: ${ka.get(k)} ≠ ${kb.get(k)}`)
    }
    const n = a.status.positive + a.status.negative
    if (arc && (!closeSums(a.arc?.cos, b.arc?.cos, n) || !closeSums(a.arc?.sin, b.arc?.sin, n))) differences.push(`group "${key}" arc ${JSON.stringify(a.arc)} ≠ ${JSON.stringify(b.arc)}`)
  }
  if (sql.profile || memory.profile) {
    const fields = ['n', 'min', 'max', 'atMin', 'atMax', 'whole', 'roundHundreds', 'commonLength'] as const
    for (const field of fields) {
      if (memory.profile?.[field] !== sql.profile?.[field]) differences.push(`profile ${field}: ${memory.profile?.[field]} ≠ ${sql.profile?.[field]}`)
    }
  }
  if (differences.length) throw new Error(`column scan differs from SQL: ${differences.slice(0, 8).join('; ')}`)
}
