import { LRUCache } from 'lru-cache'
import { assertFewGroups } from './group-cap'
import { byDistribution, DISTRIBUTIONS, isGroupable, MINIMUM_VALUES, RULES, compareDecimal, runDigitTest, thresholdBand, decimalToText, toDecimal } from '#shared/digits'
import type {
  ColumnProfile as CountedProfile, DistributionCounts, DuplicateCounts, RoundCounts, SignFilter, StatusCounts,
  SummationCounts, TestCountsMap, TestName, TestResult, ThresholdCounts, DistributionTest,
} from '#shared/digits'
import type { DigitTestRequestBody } from '#shared/schemas/dataset'
import type { ColumnDTO } from '#shared/types/dataset'
import type { Dataset, DatasetColumn } from '../../models'
import { datasetColumns } from './catalog'
import { cubeKeyIndex, profileFromCells } from './digit-cube'
import { cellsPassing, cubeCells } from './cube-cells'
import { FIELD_COLUMNS, numbersOfSign as ofSign, signCode, STATUS_CODES, statusCountOf } from './digit-columns'
import { buildDigitQuery, columnByName, decodeGroups, rawSelect, selectRows } from './digit-query'
import type { CodeFilter, DigitQuery } from './digit-query'
import { bucketOf, emptyStatus, groupCells, mergeGroups } from './count-merge'
import type { Grouped } from './count-merge'
import { ladderDistribution } from './ladder-counts'
import { codeRepeats } from './code-repeats'
import { columnScanMode, scanDistribution } from './column-scan'
import { assertSameCounts } from './column-scan-check'

async function statusCounts(query: DigitQuery, grouped: boolean): Promise<Grouped<StatusCounts>> {
  const rows = await selectRows<{ grp?: string, status: number, sign: number, count: number }>(query, {
    select: 'd.status, d.sign, count(*)::int AS count', groupBy: 'd.status, d.sign', grouped,
  })
  const byGroup: Grouped<StatusCounts> = new Map()
  for (const row of rows) {
    const status = bucketOf(byGroup, row.grp ?? null, emptyStatus)
    status[statusCountOf(row.status, row.sign)] += row.count
  }
  return byGroup
}

/** Status counts and digit counts in one scan: GROUP BY [group,] status, sign, digit field. */
async function statusAndDistribution(test: DistributionTest, query: DigitQuery, sign: SignFilter, grouped: boolean): Promise<Grouped<DistributionCounts>> {
  const field = `d.${FIELD_COLUMNS[DISTRIBUTIONS[test].field]}`
  const rows = await selectRows<{ grp?: string, status: number, sign: number, key: number | null, count: number, cos: number | null, sin: number | null }>(query, {
    select: `d.status, d.sign, ${field} AS key, count(*)::int AS count, sum(cos(2 * pi() * d.mantissa)) FILTER (WHERE ${field} IS NOT NULL) AS cos, sum(sin(2 * pi() * d.mantissa)) FILTER (WHERE ${field} IS NOT NULL) AS sin`,
    groupBy: `d.status, d.sign, ${field}`, grouped,
  })
  const wanted = signCode(sign)
  const byGroup: Grouped<DistributionCounts & { arc: { cos: number, sin: number } }> = new Map()
  for (const row of rows) {
    const entry = bucketOf(byGroup, row.grp ?? null, () => ({ status: emptyStatus(), keys: [], arc: { cos: 0, sin: 0 } }))
    entry.status[statusCountOf(row.status, row.sign)] += row.count
    if (row.status !== STATUS_CODES.number || row.sign !== wanted) continue
    entry.keys.push({ key: row.key, count: row.count })
    entry.arc.cos += Number(row.cos ?? 0)
    entry.arc.sin += Number(row.sin ?? 0)
  }
  return byGroup
}

async function summationCounts(query: DigitQuery, sign: SignFilter, grouped: boolean) {
  const rows = await selectRows<{ grp?: string, key: number | null, count: number, amount: string }>(query, {
    select: 'd.first_two AS key, count(*)::int AS count, sum(abs(d.value))::text AS amount', extra: ofSign(sign), groupBy: 'd.first_two', grouped,
  })
  const byGroup: Grouped<Omit<SummationCounts, 'status'>> = new Map()
  for (const row of rows) bucketOf(byGroup, row.grp ?? null, () => ({ keys: [] })).keys.push({ key: row.key, count: row.count, amount: row.amount })
  return byGroup
}

/**
 * Repeated values of the query's records, in one GROUP BY value: how many distinct values, how many
 * repeat and in how many rows, and the 50 most repeated. Also run once after an import for each whole
 * column (import.ts keeps it in dataset_columns.repeats).
 */
export async function duplicateCounts(query: Pick<DigitQuery, 'from' | 'where' | 'replacements'>, sign: SignFilter): Promise<Omit<DuplicateCounts, 'status'>> {
  const [row] = await rawSelect<{ distinct: number, values: number, rows: number, top: Array<{ value: string, count: number }> | null }>(
    `WITH g AS MATERIALIZED (SELECT d.value, count(*)::int AS c FROM ${query.from} WHERE ${query.where} AND ${ofSign(sign)} GROUP BY d.value)
     SELECT (SELECT count(*) FROM g)::int AS distinct, (SELECT count(*) FROM g WHERE c > 1)::int AS values,
       (SELECT coalesce(sum(c), 0) FROM g WHERE c > 1)::int AS rows,
       (SELECT json_agg(json_build_object('value', t.value::text, 'count', t.c) ORDER BY t.c DESC, t.value)
          FROM (SELECT value, c FROM g WHERE c > 1 ORDER BY c DESC, value LIMIT 50) t) AS top`,
    query.replacements,
  )
  return { distinct: row?.distinct ?? 0, repeated: { values: row?.values ?? 0, rows: row?.rows ?? 0 }, top: row?.top ?? [] }
}

async function roundCounts(query: DigitQuery, sign: SignFilter): Promise<Omit<RoundCounts, 'status'>> {
  const cells = await selectRows<RoundCounts['cells'][number]>(query, {
    select: 'd.integer_digits AS "integerDigits", d.trailing_zeros AS "trailingZeros", d.fraction_digits AS "fractionDigits", count(*)::int AS count',
    extra: ofSign(sign), groupBy: 'd.integer_digits, d.trailing_zeros, d.fraction_digits',
  })
  return { cells }
}

async function thresholdCounts(query: DigitQuery, sign: SignFilter, limit: number): Promise<Omit<ThresholdCounts, 'status'>> {
  const band = thresholdBand({ limit })
  const buckets = await selectRows<{ bucket: number, count: number }>(query, {
    select: 'floor((abs(d.value) - CAST(:low AS numeric)) / CAST(:width AS numeric))::int AS bucket, count(*)::int AS count',
    extra: `${ofSign(sign)} AND abs(d.value) >= CAST(:low AS numeric) AND abs(d.value) < CAST(:high AS numeric)`, groupBy: '1',
  }, { low: decimalToText(band.low), width: decimalToText(band.width), high: decimalToText(band.high) })
  return { buckets }
}

/** What an import stored about the tested column: its suitability facts and which digit counts it kept. */
export async function storedColumn(datasetId: string, position: number) {
  const key = `${datasetId}:${position}`
  const hit = keptStored.get(key)
  if (hit) return hit
  const stored = await useDb().models.DatasetColumn.findOne({ where: { datasetId, position }, attributes: ['profiles', 'cubeGroups', 'cubePairs', 'repeats', 'ladder'] })
  // Kept once the work after the import has written its repeated values: nothing changes after that.
  if (stored?.repeats) keptStored.set(key, stored)
  return stored
}
const keptStored = new LRUCache<string, DatasetColumn>({ max: 2000 })

/**
 * The column facts the suitability check reads (ColumnProfile in the engine): stored at import
 * for a whole column, counted here when filters narrow the rows.
 */
async function suitabilityProfile(stored: Awaited<ReturnType<typeof storedColumn>>, query: DigitQuery, sign: SignFilter, filtered: boolean, fromCells?: CellProfile): Promise<CountedProfile | null> {
  if (!filtered && stored?.profiles) return stored.profiles[sign]
  const wholeTop = stored?.profiles?.[sign]?.topValue
  if (!fromCells) return profileCounts(query, sign, wholeTop)
  // The commonest value's count of a part never exceeds the whole column's: below the rule, that bound will do.
  if (wholeTop !== undefined && wholeTop < RULES.repeated * fromCells.n) return { ...fromCells, topValue: wholeTop }
  const [top] = await selectRows<{ top: number }>(query, { select: 'count(*)::int AS top', extra: ofSign(sign), groupBy: 'd.value', tail: 'ORDER BY 1 DESC LIMIT 1' })
  return { ...fromCells, topValue: top?.top ?? 0 }
}

type CellProfile = Omit<CountedProfile, 'topValue'>

/** Which cells of the cube hold a question's counts: those of one text column, or of two together. */
interface CubeCut {
  first: number
  second: number
}

/**
 * The import's counts (digit-cube.ts) of one column for the codes the filters keep: of the whole
 * (first -1), by one text column, or by a pair of them; each cell with the codes it stands for, and
 * the suitability facts of the values the cells hold.
 */
async function cutCells(test: DistributionTest, datasetId: string, columnPos: number, cut: CubeCut, sign: SignFilter, filters: CodeFilter[]) {
  const cells = cellsPassing(await cubeCells(test, sign, datasetId, columnPos, cut.first, cut.second), filters, cut.first)
  return { cells, profile: profileFromCells(cells) }
}

/** The cells a question needs, when the cube holds them: its filters and grouping touch at most two coded text columns counted together. */
function cubeCut(query: DigitQuery, stored: NonNullable<Awaited<ReturnType<typeof storedColumn>>>): CubeCut | null {
  if (!query.codeFilters || !stored.cubeGroups || (query.group && !query.decoding)) return null
  const columns = [...new Set([...query.codeFilters.map(f => f.position), ...(query.decoding ? [query.decoding.position] : [])])].sort((a, b) => a - b)
  if (columns.length === 0) return { first: -1, second: -1 }
  if (columns.length === 1) return stored.cubeGroups.includes(columns[0]!) ? { first: columns[0]!, second: -1 } : null
  const pairs = stored.cubePairs ?? []
  for (let i = 0; i + 1 < pairs.length; i += 2) {
    if (columns.length === 2 && pairs[i] === columns[0] && pairs[i + 1] === columns[1]) return { first: columns[0]!, second: columns[1]! }
  }
  return null
}

/**
 * A distribution test's counts from the import's cube, without a scan, when it holds them: no
 * filters, or text and date filters and a grouping (by values or by the periods of dates) that
 * touch one text column, or two that were counted together. Null when the records must be counted.
 */
async function cubeDistribution(test: DistributionTest, datasetId: string, stored: Awaited<ReturnType<typeof storedColumn>>, columnPos: number, query: DigitQuery, sign: SignFilter): Promise<{ groups: Grouped<DistributionCounts>, profile: CellProfile | null } | null> {
  const cut = stored && cubeCut(query, stored)
  if (!cut) return null
  const { cells, profile } = await cutCells(test, datasetId, columnPos, cut, sign, query.codeFilters!)
  // Each cell counts toward the group of its code in the grouping column.
  const first = query.decoding?.position === cut.first
  return { groups: await groupCells(datasetId, query.decoding, cells.map(c => ({ code: first ? c.first : c.second, counts: c.counts }))), profile }
}

/**
 * A distribution test's counts (by group) from the import's cells: the cube's, or the value ladder's
 * for a range of the tested column. Null when the records must be counted.
 */
async function cellsOf(test: DistributionTest, datasetId: string, stored: Awaited<ReturnType<typeof storedColumn>>, columnPos: number, query: DigitQuery, sign: SignFilter, scan = (q: DigitQuery) => statusAndDistribution(test, q, sign, Boolean(q.group)).then(g => decodeGroups(q, g))) {
  const cells = await cubeDistribution(test, datasetId, stored, columnPos, query, sign)
    ?? await ladderDistribution(test, datasetId, stored?.ladder ?? null, columnPos, query, sign, scan)
  if (cells && 'edgesInMemory' in cells && cells.edgesInMemory && columnScanMode() === 'verify') await verifyInMemory(test, cells, query, sign, scan)
  if (cells) return { ...cells, countedFrom: 'import counts' as const }
  const memory = await inMemory(test, datasetId, columnPos, query, sign, scan)
  return memory && { ...memory, countedFrom: 'records in memory' as const }
}

/** Where a test's counts came from (the digit-tests route says it in a header, for benchmarks and tests). */
export type CountedFrom = 'import counts' | 'records in memory' | 'records in SQL'

/** The counts from the column's records in memory (column-scan.ts); in "verify" mode checked against SQL's. */
async function inMemory(test: DistributionTest, datasetId: string, columnPos: number, query: DigitQuery, sign: SignFilter, scan: (q: DigitQuery) => Promise<Grouped<DistributionCounts>>) {
  const answer = await scanDistribution(test, datasetId, columnPos, query, sign)
  if (answer && columnScanMode() === 'verify') await verifyInMemory(test, answer, query, sign, scan)
  return answer
}

/** "verify" mode: an answer counted (in part) in memory is checked against SQL's count of the same records. */
async function verifyInMemory(test: DistributionTest, answer: Parameters<typeof assertSameCounts>[0], query: DigitQuery, sign: SignFilter, scan: (q: DigitQuery) => Promise<Grouped<DistributionCounts>>) {
  assertSameCounts(answer, { groups: await scan(query), profile: await profileCounts(query, sign) }, DISTRIBUTIONS[test].arc)
}

/**
 * How many values one bin holds, as the import counted them: for the drill-down of an unfiltered
 * distribution test, whole or in one group, so its page count needs no scan. Null when not kept.
 */
export async function cubeBinCount(datasetId: string, tested: ColumnDTO, bin: { test: DistributionTest, key: number, sign: SignFilter }, group?: { column: ColumnDTO, value: string }): Promise<number | null> {
  const stored = await storedColumn(datasetId, tested.position)
  const groupPos = group ? group.column.position : -1
  if (!stored?.cubeGroups?.includes(groupPos)) return null
  const [row] = await rawSelect<{ count: number }>(
    `SELECT coalesce((SELECT counts[${cubeKeyIndex(bin.test, bin.sign, bin.key)}] FROM digit_cube
       WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = :groupPos AND pair_pos = -1 AND group_code = ${group
          ? '(SELECT code FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = :groupPos AND value = :group)'
          : '0'}), 0) AS count`,
    { datasetId, columnPos: tested.position, groupPos, group: group?.value.trim() },
  )
  return row?.count ?? 0
}

/**
 * The suitability facts of the query's values. One pass by number of integer digits gives n, the
 * ends, whole and round counts and the commonest length. How many values sit at each end and how
 * often the commonest value repeats matter only when they could reach the pile-up or repeated-value
 * rule: the whole column's commonest value (`wholeTop`, exact) bounds all three, so below the rules
 * they keep that bound and cost no second scan.
 */
async function profileCounts(query: DigitQuery, sign: SignFilter, wholeTop?: number): Promise<CountedProfile | null> {
  const lengths = await selectRows<{ n: number, min: string, max: string, whole: number, round: number }>(query, {
    select: `count(*)::int AS n, min(abs(d.value))::text AS min, max(abs(d.value))::text AS max,
      (count(*) FILTER (WHERE d.fraction_digits = 0))::int AS whole,
      (count(*) FILTER (WHERE d.fraction_digits = 0 AND d.trailing_zeros >= 2))::int AS round`,
    extra: ofSign(sign), groupBy: 'd.integer_digits',
  })
  if (!lengths.length) return null
  const byValue = (a: string, b: string) => compareDecimal(toDecimal(a), toDecimal(b))
  const n = lengths.reduce((sum, l) => sum + l.n, 0)
  const min = lengths.map(l => l.min).reduce((a, b) => (byValue(a, b) <= 0 ? a : b))
  const max = lengths.map(l => l.max).reduce((a, b) => (byValue(a, b) >= 0 ? a : b))
  const profile: CountedProfile = {
    n, min, max, atMin: 0, atMax: 0,
    whole: lengths.reduce((sum, l) => sum + l.whole, 0),
    roundHundreds: lengths.reduce((sum, l) => sum + l.round, 0),
    commonLength: Math.max(...lengths.map(l => l.n)),
    topValue: 0,
  }
  const bound = wholeTop ?? n
  if (bound < Math.min(RULES.pileUp, RULES.repeated) * n) return { ...profile, atMin: bound, atMax: bound, topValue: bound }
  const signed = (text: string) => (sign === 'positive' ? text : `-${text}`)
  const [ends, top] = await Promise.all([
    selectRows<{ atMin: number, atMax: number }>(query, {
      select: '(count(*) FILTER (WHERE d.value = CAST(:atMin AS numeric)))::int AS "atMin", (count(*) FILTER (WHERE d.value = CAST(:atMax AS numeric)))::int AS "atMax"',
      extra: `${ofSign(sign)} AND d.value IN (CAST(:atMin AS numeric), CAST(:atMax AS numeric))`,
    }, { atMin: signed(min), atMax: signed(max) }),
    selectRows<{ top: number }>(query, { select: 'count(*)::int AS top', extra: ofSign(sign), groupBy: 'd.value', tail: 'ORDER BY 1 DESC LIMIT 1' }),
  ])
  return { ...profile, atMin: ends[0]?.atMin ?? 0, atMax: ends[0]?.atMax ?? 0, topValue: top[0]?.top ?? 0 }
}

type CountsQuery = (query: DigitQuery, sign: SignFilter, grouped: boolean, threshold?: number) => Promise<Grouped<object>>

/** Why a test ranks no groups, in the words the settings form and the API give. */
export const UNGROUPED_REASON = 'Repeated amounts, round amounts and the threshold test are not ranked by group: '
  + 'they have no expected distribution to measure each group against. Filter the rows to one group instead.'

/** A test that ranks no groups: one set of counts for the whole selection. */
const ungrouped = (count: (query: DigitQuery, sign: SignFilter, threshold?: number) => Promise<object>): CountsQuery =>
  async (query, sign, _grouped, threshold) => new Map([[null, await count(query, sign, threshold)]])

/** The SQL behind each test's counts: a new test is a type error here until it has its own. */
const TEST_COUNTS: Record<TestName, CountsQuery> = {
  ...byDistribution(test => (query, sign, grouped) => statusAndDistribution(test, query, sign, grouped)),
  'summation': summationCounts,
  'duplicates': ungrouped(duplicateCounts),
  'round-numbers': ungrouped(roundCounts),
  'threshold': ungrouped((query, sign, threshold) => thresholdCounts(query, sign, threshold!)),
}

/**
 * Runs one digit test on a stored dataset: PostgreSQL counts the stored digit records
 * (filtered, optionally per group), the engine turns the counts into statistics. Where the
 * import's counts hold the answer (no filters, or filters on the grouping column only) they are
 * read instead of the records.
 */
export async function runDatasetTest(dataset: Dataset, body: DigitTestRequestBody, report?: (from: CountedFrom) => void): Promise<TestResult> {
  if (dataset.status !== 'ready') throw fail(409, { message: 'This dataset is not ready yet: wait for its import to finish.' })
  const columns = await datasetColumns(dataset.id)
  const tested = columnByName(columns, body.column, 'column')
  if (!tested.numeric) throw fail(400, [{ path: 'column', message: `"${tested.name}" does not hold numbers. Choose an amount or count column.` }])
  if (body.groupBy && !isGroupable(body.test)) throw fail(400, [{ path: 'groupBy', message: UNGROUPED_REASON }])
  const sign = body.sign ?? 'positive'
  const filtered = Boolean(body.filters?.length)
  const [whole, grouping, stored] = await Promise.all([
    buildDigitQuery(dataset.id, columns, tested, body.filters),
    body.groupBy ? buildDigitQuery(dataset.id, columns, tested, body.filters, body.groupBy, body.period) : null,
    storedColumn(dataset.id, tested.position),
  ])
  // Periods are few by nature; a text column may hold a value per row (group-cap.ts).
  if (grouping && !body.period) await assertFewGroups(grouping, body.groupBy!)
  let counts: TestCountsMap[TestName]
  let groupCounts: Grouped<{ status: StatusCounts }> | null = null
  let profile: Promise<CountedProfile | null>
  if (body.test in DISTRIBUTIONS) {
    // One scan answers both the status and the digit counts; with groups, the whole is their sum.
    const test = body.test as DistributionTest
    const counted = grouping ?? whole
    const scan = (query: DigitQuery) => statusAndDistribution(test, query, sign, Boolean(grouping)).then(g => (grouping ? decodeGroups(query, g) : g))
    const fromCube = await cellsOf(test, dataset.id, stored, tested.position, counted, sign, scan)
    profile = suitabilityProfile(stored, whole, sign, filtered, fromCube?.profile ?? undefined)
    report?.(fromCube?.countedFrom ?? 'records in SQL')
    const scanned: Grouped<DistributionCounts> = fromCube?.groups ?? await scan(counted)
    counts = grouping ? mergeGroups(scanned.values()) : scanned.get(null) ?? { status: emptyStatus(), keys: [] }
    groupCounts = grouping ? scanned : null
  }
  else {
    // The status counts and the suitability facts, from the import's cells where they hold them.
    const cells = await cellsOf('first-digit', dataset.id, stored, tested.position, whole, sign)
    profile = suitabilityProfile(stored, whole, sign, filtered, cells?.profile ?? undefined)
    const repeats = body.test !== 'duplicates' ? null : filtered ? await codeRepeats(dataset.id, tested.position, whole.codeFilters, sign) : stored?.repeats?.[sign]
    report?.(repeats ? 'import counts' : 'records in SQL')
    const [status, byTest] = await Promise.all([
      cells ? new Map([[null, mergeGroups(cells.groups.values()).status]]) : statusCounts(whole, false),
      repeats ? new Map([[null, repeats]]) : TEST_COUNTS[body.test](whole, sign, false, body.threshold),
    ])
    counts = { status: status.get(null) ?? emptyStatus(), ...byTest.get(null) } as TestCountsMap[TestName]
    if (grouping) {
      const [byStatus, byCounts] = await Promise.all([statusCounts(grouping, true), TEST_COUNTS[body.test](grouping, sign, true)])
      groupCounts = await decodeGroups(grouping, new Map([...byStatus].map(([key, s]) => [key, { status: s, ...(byCounts.get(key) ?? { keys: [] }) }])))
    }
  }
  const input = { counts, profile: await profile }
  const groups: Parameters<typeof runDigitTest>[0]['groups'] = groupCounts
    ? {
        // Groups are ranked by excess MAD, which already allows for size; only hopeless groups are skipped.
        minSize: MINIMUM_VALUES[body.test]?.stop,
        items: [...groupCounts].map(([key, group]) => ({ key: key ?? '', input: { counts: group as TestCountsMap[TestName] } })),
      }
    : undefined
  try {
    return runDigitTest({ test: body.test, input, column: tested.name, sign, threshold: body.threshold ? { limit: body.threshold } : undefined, groups })
  }
  catch (error) {
    if (error instanceof RangeError) throw fail(400, [{ path: 'threshold', message: error.message }])
    throw error
  }
}
