import type { DistributionCounts, DistributionTest, SignFilter } from '#shared/digits'
import { LRUCache } from 'lru-cache'
import { cubeFactSlices, cubeSlices, countsFromCube } from './digit-cube'
import { rawSelect } from './digit-query'
import type { CodeFilter } from './digit-query'

/** One cell of the import's cube (digit-cube.ts) as one test and sign read it. */
export interface CubeCell {
  /** The cell's codes in its first and second text column (-1: none). */
  first: number
  second: number
  counts: DistributionCounts
  /** How many values of the sign the cell holds, with their suitability facts in the cube's layout. */
  n: number
  facts: number[] | null
  ends: string[] | null
}

/**
 * The cells of one slice of the cube (a number column, by one text column, a pair of them, or the
 * value ladder), as one test and sign read them. A ready dataset's cube never changes, so each server
 * reads a slice once and keeps it, least recently used first out past a budget of numbers held;
 * questions then pick their cells in memory instead of asking PostgreSQL for them each time.
 */
export async function cubeCells(test: DistributionTest, sign: SignFilter, datasetId: string, columnPos: number, groupPos: number, pairPos: number): Promise<readonly CubeCell[]> {
  const key = `${datasetId}:${columnPos}:${groupPos}:${pairPos}:${test}:${sign}`
  const hit = kept.get(key)
  if (hit) return hit
  const slices = cubeSlices(test, sign)
  const facts = cubeFactSlices(sign)
  const rows = await rawSelect<{ first: number, second: number, status: number[], keys: number[], arc: number[], facts: number[] | null, ends: string[] | null }>(
    `SELECT group_code AS first, pair_code AS second, ${slices.status} AS status, ${slices.keys} AS keys, ${slices.arc} AS arc, ${facts.facts} AS facts, ${facts.ends} AS ends
     FROM digit_cube WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = :groupPos AND pair_pos = :pairPos`,
    { datasetId, columnPos, groupPos, pairPos },
  )
  // Frozen: every question shares these, and none may change them.
  const cells = Object.freeze(rows.map((row) => {
    const counts = deepFreeze(countsFromCube(test, sign, row))
    return Object.freeze({ first: row.first, second: row.second, counts, n: counts.status[sign], facts: row.facts && Object.freeze(row.facts), ends: row.ends && Object.freeze(row.ends) }) as CubeCell
  }))
  kept.set(key, cells)
  return cells
}

const kept = new LRUCache<string, readonly CubeCell[]>({
  // About 140 numbers a cell for the first two digits; 4M numbers is some 40 MB.
  maxSize: 4_000_000,
  sizeCalculation: cells => Math.max(1, cells.reduce((sum, cell) => sum + 8 + cell.counts.keys.length * 2 + (cell.facts?.length ?? 0), 0)),
})

function deepFreeze<T extends DistributionCounts>(counts: T): T {
  counts.keys.forEach(Object.freeze)
  Object.freeze(counts.keys)
  Object.freeze(counts.status)
  if (counts.arc) Object.freeze(counts.arc)
  return Object.freeze(counts)
}

/**
 * The cells whose codes pass every filter, as SQL's `code = ANY(…)` and `NOT (…)` keep them: a filter
 * on `firstPos` reads a cell's first code, any other its second.
 */
export function cellsPassing(cells: readonly CubeCell[], filters: readonly CodeFilter[], firstPos: number): CubeCell[] {
  const tests = filters.map(filter => ({ first: filter.position === firstPos, codes: new Set(filter.codes), negate: filter.negate }))
  return cells.filter(cell => tests.every(t => t.codes.has(t.first ? cell.first : cell.second) !== t.negate))
}
