import type { DistributionCounts, DistributionTest, SignFilter } from '#shared/digits'
import type { ValueLadder } from '#shared/types/dataset'
import { mergeGroups } from './count-merge'
import type { Grouped } from './count-merge'
import { numbersOfSign } from './digit-columns'
import { factsCell, profileFromCells } from './digit-cube'
import { cellsPassing, cubeCells } from './cube-cells'
import { rawSelect } from './digit-query'
import type { DigitQuery } from './digit-query'
import { countInMemory, recordsInMemory } from './column-scan'
import { LADDER_FINE, rangeOnRungs, rungsOf } from './value-ladder'

/**
 * A distribution test's counts when its only filters are ranges of the tested column and it has no
 * grouping: the rungs of the value ladder the range holds whole are added up from the import's cells,
 * and only the records in the parts of the rungs it cuts through are counted (`scan`). Null when the
 * ladder cannot answer (ranges beside text filters or a grouping are counted in memory, column-scan.ts).
 */
export async function ladderDistribution(
  test: DistributionTest, datasetId: string, ladder: ValueLadder | null, columnPos: number, query: DigitQuery, sign: SignFilter,
  scan: (query: DigitQuery) => Promise<Grouped<DistributionCounts>>,
): Promise<{ groups: Grouped<DistributionCounts>, profile: ReturnType<typeof profileFromCells>, edgesInMemory: boolean } | null> {
  const range = query.testedRange
  if (!range || !ladder || query.group || range.codeFilters.length) return null
  const cut = rangeOnRungs(rungsOf(ladder.bounds), range)
  if (!cut) return null

  const rungs = cubeCells(test, sign, datasetId, columnPos, LADDER_FINE, -1)
    .then(cells => cellsPassing(cells, [{ position: LADDER_FINE, codes: cut.codes, negate: false }], LADDER_FINE))
  // The records in the parts of the rungs beside: [min, low) and [high, max], each an index range.
  const parts = [
    cut.below && '(d.value >= :partMin AND d.value < CAST(:partBelow AS numeric))',
    cut.above && '(d.value >= CAST(:partFrom AS numeric) AND d.value <= :partMax)',
  ].filter(Boolean)
  const edge: DigitQuery | null = parts.length
    ? {
        ...query,
        where: `${range.besideRange} AND (${parts.join(' OR ')})`,
        replacements: { ...query.replacements, partMin: cut.below?.min, partBelow: cut.below?.below, partFrom: cut.above?.from, partMax: cut.above?.max },
      }
    : null
  // The parts' records are counted in memory when the column is there (column-scan.ts), else by SQL.
  const records = edge ? await recordsInMemory(datasetId, columnPos) : null
  const inMemory = records && await Promise.all([
    cut.below && { min: cut.below.min, below: Number(cut.below.below) },
    cut.above && { min: Number(cut.above.from), max: cut.above.max },
  ].flatMap(range => (range ? [countInMemory(datasetId, columnPos, records, { test, sign, filters: [], range, groupBy: null }).then(counted => counted!)] : [])))
  const [cells, edgeCounts, edgeFacts] = await Promise.all([
    rungs,
    inMemory ? inMemory.flatMap(part => part.cells.map(c => c.counts)) : edge ? scan(edge).then(groups => [...groups.values()]) : [],
    inMemory
      ? inMemory.flatMap(({ profile, lengths }) => (profile ? [factsCell({ ...profile, round: profile.roundHundreds, lengths })] : []))
      : edge ? factsOf(edge, sign).then(facts => [facts]) : [],
  ])
  const counts = [...cells.map(cell => cell.counts), ...edgeCounts]
  return { groups: new Map([[null, mergeGroups(counts)]]), profile: profileFromCells([...cells, ...edgeFacts]), edgesInMemory: Boolean(inMemory) }
}

/** The suitability facts of the records a query keeps, of one sign, in a cell's layout (factsCell), in one pass over them. */
async function factsOf(query: DigitQuery, sign: SignFilter) {
  const lengths = await rawSelect<{ length: number, n: number, min: string, max: string, whole: number, round: number, atMin: number, atMax: number }>(
    `WITH e AS MATERIALIZED (SELECT abs(d.value) AS a, d.integer_digits, d.fraction_digits, d.trailing_zeros FROM ${query.from} WHERE ${query.where} AND ${numbersOfSign(sign)}),
       ends AS (SELECT min(a) AS low, max(a) AS high FROM e)
     SELECT e.integer_digits AS length, count(*)::int AS n, min(e.a)::text AS min, max(e.a)::text AS max,
       (count(*) FILTER (WHERE e.fraction_digits = 0))::int AS whole,
       (count(*) FILTER (WHERE e.fraction_digits = 0 AND e.trailing_zeros >= 2))::int AS round,
       (count(*) FILTER (WHERE e.a = ends.low))::int AS "atMin", (count(*) FILTER (WHERE e.a = ends.high))::int AS "atMax"
     FROM e, ends GROUP BY e.integer_digits`,
    query.replacements,
  )
  if (!lengths.length) return { n: 0, facts: null, ends: null }
  // The smallest and largest: the shortest and the longest values' own ends (same sign, absolute).
  const byLength = [...lengths].sort((a, b) => a.length - b.length)
  const sum = (field: 'n' | 'whole' | 'round' | 'atMin' | 'atMax') => lengths.reduce((total, l) => total + l[field], 0)
  return factsCell({
    n: sum('n'), whole: sum('whole'), round: sum('round'), min: byLength[0]!.min, max: byLength.at(-1)!.max,
    atMin: sum('atMin'), atMax: sum('atMax'), lengths: new Map(lengths.map(l => [l.length, l.n])),
  })
}
