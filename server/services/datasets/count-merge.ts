import type { DistributionCounts, StatusCounts } from '#shared/digits'
import { groupNames } from './digit-query'
import type { GroupDecoding } from './digit-query'

/** Counts by group text (null: the whole selection). */
export type Grouped<T> = Map<string | null, T>

export function bucketOf<T>(map: Grouped<T>, key: string | null, make: () => T): T {
  let entry = map.get(key)
  if (!entry) map.set(key, entry = make())
  return entry
}

export const emptyStatus = (): StatusCounts => ({ blank: 0, unreadable: 0, zero: 0, positive: 0, negative: 0 })

/** Digit keys run from 0 to 999 (first three digits); they are added up in a dense array. */
const KEY_SLOTS = 1000

/**
 * The sum of several sets of counts: a group's cells, or the whole as the sum of its groups. One set
 * is its own sum (counts are never changed once made; the cube's are frozen). Keys come out in
 * ascending order, the values without a key (null) last.
 */
export function mergeGroups(groups: Iterable<DistributionCounts>): DistributionCounts {
  if (Array.isArray(groups) && groups.length === 1) return groups[0] as DistributionCounts
  const status = emptyStatus()
  const sums = new Float64Array(KEY_SLOTS)
  const seen = new Uint8Array(KEY_SLOTS)
  const others = new Map<number | string | null, number>()
  const arc = { cos: 0, sin: 0 }
  for (const group of groups) {
    status.blank += group.status.blank
    status.unreadable += group.status.unreadable
    status.zero += group.status.zero
    status.positive += group.status.positive
    status.negative += group.status.negative
    for (const { key, count } of group.keys) {
      if (typeof key === 'number' && Number.isInteger(key) && key >= 0 && key < KEY_SLOTS) {
        sums[key]! += count
        seen[key] = 1
      }
      else others.set(key, (others.get(key) ?? 0) + count)
    }
    arc.cos += group.arc?.cos ?? 0
    arc.sin += group.arc?.sin ?? 0
  }
  const keys: DistributionCounts['keys'] = []
  for (let key = 0; key < KEY_SLOTS; key++) if (seen[key]) keys.push({ key, count: sums[key]! })
  const withoutKey = others.get(null)
  others.delete(null)
  for (const [key, count] of others) keys.push({ key, count })
  if (withoutKey !== undefined) keys.push({ key: null, count: withoutKey })
  return { status, keys, arc }
}

/**
 * Cells (of the import's counts, or of a pass over the records in memory) added up by group: all
 * together without a grouping, else by the group text of each cell's code in the grouping column, or
 * by the period of its date. As SQL's GROUP BY has them, a code whose text reads as no date, and a
 * record with no code, fall in the group ''.
 */
export async function groupCells(datasetId: string, decoding: GroupDecoding | null, cells: { code: number, counts: DistributionCounts }[]): Promise<Grouped<DistributionCounts>> {
  if (!decoding) return new Map([[null, mergeGroups(cells.map(c => c.counts))]])
  const labelOf = new Map<number, string>()
  if (decoding.periods) {
    for (const [label, codes] of decoding.periods) for (const code of codes) labelOf.set(code, label)
  }
  else {
    for (const [code, name] of await groupNames(datasetId, decoding)) labelOf.set(Number(code), name)
  }
  const byLabel = new Map<string, DistributionCounts[]>()
  for (const { code, counts } of cells) {
    const label = labelOf.get(code) ?? ''
    const list = byLabel.get(label)
    if (list) list.push(counts)
    else byLabel.set(label, [counts])
  }
  return new Map([...byLabel].map(([label, lists]) => [label, mergeGroups(lists)]))
}
