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

/**
 * The sum of several sets of counts: a group's cells, or the whole as the sum of its groups. One set
 * is its own sum (counts are never changed once made; the cube's are frozen).
 */
export function mergeGroups(groups: Iterable<DistributionCounts>): DistributionCounts {
  if (Array.isArray(groups) && groups.length === 1) return groups[0] as DistributionCounts
  const status = emptyStatus()
  const keys = new Map<number | string | null, number>()
  const arc = { cos: 0, sin: 0 }
  for (const group of groups) {
    for (const name of Object.keys(status) as (keyof StatusCounts)[]) status[name] += group.status[name]
    for (const { key, count } of group.keys) keys.set(key, (keys.get(key) ?? 0) + count)
    arc.cos += group.arc?.cos ?? 0
    arc.sin += group.arc?.sin ?? 0
  }
  return { status, keys: [...keys].map(([key, count]) => ({ key, count })), arc }
}

/**
 * Cells of the import's counts added up by group: all together without a grouping, else by the
 * group text of each cell's code in the grouping column, or by the period of its date.
 */
export async function groupCells(datasetId: string, decoding: GroupDecoding | null, cells: { code: number, counts: DistributionCounts }[]): Promise<Grouped<DistributionCounts>> {
  if (!decoding) return new Map([[null, mergeGroups(cells.map(c => c.counts))]])
  const byCode = new Map<number, DistributionCounts[]>()
  for (const { code, counts } of cells) {
    const list = byCode.get(code)
    if (list) list.push(counts)
    else byCode.set(code, [counts])
  }
  if (!decoding.periods) {
    const names = await groupNames(datasetId, decoding)
    return new Map([...byCode].map(([code, lists]) => [names.get(String(code)) ?? '', mergeGroups(lists)]))
  }
  const byPeriod: Grouped<DistributionCounts> = new Map()
  for (const [label, codes] of decoding.periods) {
    const lists = codes.flatMap(code => byCode.get(code) ?? [])
    if (lists.length) byPeriod.set(label, mergeGroups(lists))
  }
  return byPeriod
}
