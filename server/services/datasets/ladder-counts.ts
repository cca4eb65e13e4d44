import type { DistributionCounts, DistributionTest, SignFilter } from '#shared/digits'
import type { ValueLadder } from '#shared/types/dataset'
import { groupCells, mergeGroups } from './count-merge'
import type { Grouped } from './count-merge'
import { numbersOfSign } from './digit-columns'
import { cubeFactSlices, cubeSlices, countsFromCube, factsCell, profileFromCells } from './digit-cube'
import { codeCondition, intArray, rawSelect } from './digit-query'
import type { DigitQuery } from './digit-query'
import { LADDER_COARSE, LADDER_FINE, rangeOnRungs, rungsOf } from './value-ladder'

type CellRow = { code: number, status: number[], keys: number[], arc: number[], facts: number[] | null, ends: string[] | null }

/**
 * A distribution test's counts when its filters are ranges of the tested column beside text and
 * date filters and a grouping on at most one text column: the rungs of the value ladder the range
 * holds whole are added up from the import's cells (by that text column's codes, on the coarse
 * ladder), and only the records in the parts of the rungs it cuts through are counted (`scan`,
 * which also groups and decodes them). Null when the ladder cannot answer.
 */
export async function ladderDistribution(
  test: DistributionTest, datasetId: string, ladder: ValueLadder | null, columnPos: number, query: DigitQuery, sign: SignFilter,
  scan: (query: DigitQuery) => Promise<Grouped<DistributionCounts>>, part: 'all' | 'counts' | 'facts' = 'all',
): Promise<{ groups: Grouped<DistributionCounts>, profile: ReturnType<typeof profileFromCells> } | null> {
  const range = query.testedRange
  if (!range || !ladder || (query.group && !query.decoding)) return null
  const texts = new Set([...range.codeFilters.map(f => f.position), ...(query.decoding ? [query.decoding.position] : [])])
  if (texts.size > 1) return null
  const [text] = texts
  if (text !== undefined && !ladder.pairs.includes(text)) return null
  if (part === 'all' && query.decoding && !range.codeFilters.length) {
    // Grouped, not filtered by the grouping column: the whole selection's facts come from the fine
    // ladder, whose cut rungs are four times thinner than the coarse ones the groups are counted on.
    const whole = { ...query, group: null, groupEquals: null, decoding: null }
    const [counts, facts] = await Promise.all([
      ladderDistribution(test, datasetId, ladder, columnPos, query, sign, scan, 'counts'),
      ladderDistribution(test, datasetId, ladder, columnPos, whole, sign, scan, 'facts'),
    ])
    return counts && facts && { groups: counts.groups, profile: facts.profile }
  }
  const cut = rangeOnRungs(rungsOf(ladder.bounds, text === undefined ? 1 : ladder.step), range)
  if (!cut) return null

  const slices = cubeSlices(test, sign)
  const facts = cubeFactSlices(sign)
  const kept = range.codeFilters.map(filter => ` AND ${codeCondition('pair_code', filter)}`).join('')
  const cellRows = rawSelect<CellRow>(
    `SELECT pair_code AS code, ${slices.status} AS status, ${slices.keys} AS keys, ${slices.arc} AS arc,
       ${part === 'counts' ? 'NULL AS facts, NULL AS ends' : `${facts.facts} AS facts, ${facts.ends} AS ends`}
     FROM digit_cube WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = ${text === undefined ? LADDER_FINE : LADDER_COARSE}
       AND pair_pos = ${text ?? -1} AND group_code = ANY(${intArray(cut.codes)})${kept}`,
    { datasetId, columnPos },
  )
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
  const [rows, edgeGroups, edgeFacts] = await Promise.all([
    cellRows, edge && part !== 'facts' ? scan(edge) : new Map(), edge && part !== 'counts' ? factsOf(edge, sign) : null,
  ])
  const cells = rows.map(row => ({ code: row.code, counts: countsFromCube(test, sign, row) }))
  const groups = await groupCells(datasetId, query.decoding, cells)
  for (const [key, counts] of edgeGroups as Grouped<DistributionCounts>) groups.set(key, groups.has(key) ? mergeGroups([groups.get(key)!, counts]) : counts)
  if (part === 'counts') return { groups, profile: null }
  const cellFacts = rows.map((row, i) => ({ n: cells[i]!.counts.status[sign], facts: row.facts, ends: row.ends }))
  return { groups, profile: profileFromCells(edgeFacts ? [...cellFacts, edgeFacts] : cellFacts) }
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
