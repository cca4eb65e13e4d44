import { byDistribution, DISTRIBUTIONS, isGroupable, MINIMUM_VALUES, runDigitTest, thresholdBand, decimalToText } from '#shared/digits'
import type {
  ColumnProfile as CountedProfile, DistributionCounts, DuplicateCounts, RoundCounts, SignFilter, StatusCounts,
  SummationCounts, TestCountsMap, TestName, TestResult, ThresholdCounts, DistributionTest,
} from '#shared/digits'
import type { DigitTestRequestBody } from '#shared/schemas/dataset'
import type { ColumnDTO } from '#shared/types/dataset'
import type { Dataset } from '../../models'
import { datasetColumns } from './catalog'
import { cubeKeyIndex, cubeSlices, countsFromCube } from './digit-cube'
import { FIELD_COLUMNS, numbersOfSign as ofSign, signCode, STATUS_CODES, statusCountOf } from './digit-columns'
import { buildDigitQuery, columnByName, decodeGroups, rawSelect, selectRows } from './digit-query'
import type { DigitQuery } from './digit-query'

type Grouped<T> = Map<string | null, T>

function bucketOf<T>(map: Grouped<T>, key: string | null, make: () => T): T {
  let entry = map.get(key)
  if (!entry) map.set(key, entry = make())
  return entry
}

const emptyStatus = (): StatusCounts => ({ blank: 0, unreadable: 0, zero: 0, positive: 0, negative: 0 })

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

/** The whole column's counts as the sum of its groups' counts. */
function mergeGroups(groups: Grouped<DistributionCounts>): DistributionCounts {
  const status = emptyStatus()
  const keys = new Map<number | string | null, number>()
  const arc = { cos: 0, sin: 0 }
  for (const group of groups.values()) {
    for (const name of Object.keys(status) as (keyof StatusCounts)[]) status[name] += group.status[name]
    for (const { key, count } of group.keys) keys.set(key, (keys.get(key) ?? 0) + count)
    arc.cos += group.arc?.cos ?? 0
    arc.sin += group.arc?.sin ?? 0
  }
  return { status, keys: [...keys].map(([key, count]) => ({ key, count })), arc }
}

async function summationCounts(query: DigitQuery, sign: SignFilter, grouped: boolean) {
  const rows = await selectRows<{ grp?: string, key: number | null, count: number, amount: string }>(query, {
    select: 'd.first_two AS key, count(*)::int AS count, sum(abs(d.value))::text AS amount', extra: ofSign(sign), groupBy: 'd.first_two', grouped,
  })
  const byGroup: Grouped<Omit<SummationCounts, 'status'>> = new Map()
  for (const row of rows) bucketOf(byGroup, row.grp ?? null, () => ({ keys: [] })).keys.push({ key: row.key, count: row.count, amount: row.amount })
  return byGroup
}

async function duplicateCounts(query: DigitQuery, sign: SignFilter): Promise<Omit<DuplicateCounts, 'status'>> {
  const top = await selectRows<{ value: string, count: number }>(query, {
    select: 'd.value::text AS value, count(*)::int AS count', extra: ofSign(sign), groupBy: 'd.value',
    tail: 'HAVING count(*) > 1 ORDER BY count(*) DESC, d.value LIMIT 50',
  })
  const [totals = { distinct: 0, values: 0, rows: 0 }] = await rawSelect<{ distinct: number, values: number, rows: number }>(
    `SELECT count(*)::int AS distinct, (count(*) FILTER (WHERE c > 1))::int AS values, coalesce(sum(c) FILTER (WHERE c > 1), 0)::int AS rows
     FROM (SELECT count(*) AS c FROM ${query.from} WHERE ${query.where} AND ${ofSign(sign)} GROUP BY d.value) g`,
    query.replacements,
  )
  return { distinct: totals.distinct, repeated: { values: totals.values, rows: totals.rows }, top }
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
export function storedColumn(datasetId: string, position: number) {
  return useDb().models.DatasetColumn.findOne({ where: { datasetId, position }, attributes: ['profiles', 'cubeGroups'] })
}

/**
 * The column facts the suitability check reads (ColumnProfile in the engine): stored at import
 * for a whole column, counted here when filters narrow the rows.
 */
async function suitabilityProfile(stored: Awaited<ReturnType<typeof storedColumn>>, query: DigitQuery, sign: SignFilter, filtered: boolean): Promise<CountedProfile | null> {
  if (!filtered && stored?.profiles) return stored.profiles[sign]
  return profileCounts(query, sign)
}

/** A distribution test's counts as the import kept them (digit-cube.ts), whole or per group, without a scan. */
async function cubeDistribution(test: DistributionTest, datasetId: string, columnPos: number, groupPos: number, sign: SignFilter): Promise<Grouped<DistributionCounts>> {
  const slices = cubeSlices(test, sign)
  const rows = await rawSelect<{ grp: number, status: number[], keys: number[], arc: number[] }>(
    `SELECT group_code AS grp, ${slices.status} AS status, ${slices.keys} AS keys, ${slices.arc} AS arc
     FROM digit_cube WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = :groupPos`,
    { datasetId, columnPos, groupPos },
  )
  return new Map(rows.map(row => [groupPos < 0 ? null : String(row.grp), countsFromCube(test, sign, row)]))
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
       WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = :groupPos AND group_code = ${group
          ? '(SELECT code FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = :groupPos AND value = :group)'
          : '0'}), 0) AS count`,
    { datasetId, columnPos: tested.position, groupPos, group: group?.value.trim() },
  )
  return row?.count ?? 0
}

async function profileCounts(query: DigitQuery, sign: SignFilter): Promise<CountedProfile | null> {
  const [row] = await rawSelect<CountedProfile>(`
    WITH v AS MATERIALIZED (SELECT abs(d.value) AS a, d.value, d.integer_digits, d.fraction_digits, d.trailing_zeros FROM ${query.from} WHERE ${query.where} AND ${ofSign(sign)})
    SELECT (SELECT count(*) FROM v)::int AS n, (SELECT min(a) FROM v)::text AS min, (SELECT max(a) FROM v)::text AS max,
      (SELECT count(*) FROM v WHERE a = (SELECT min(a) FROM v))::int AS "atMin",
      (SELECT count(*) FROM v WHERE a = (SELECT max(a) FROM v))::int AS "atMax",
      (SELECT count(*) FROM v WHERE fraction_digits = 0)::int AS whole,
      (SELECT count(*) FROM v WHERE fraction_digits = 0 AND trailing_zeros >= 2)::int AS "roundHundreds",
      coalesce((SELECT max(c) FROM (SELECT count(*) AS c FROM v GROUP BY integer_digits) l), 0)::int AS "commonLength",
      coalesce((SELECT max(c) FROM (SELECT count(*) AS c FROM v GROUP BY value) t), 0)::int AS "topValue"
  `, query.replacements)
  return row && row.n > 0 ? row : null
}

type CountsQuery = (query: DigitQuery, sign: SignFilter, grouped: boolean, threshold?: number) => Promise<Grouped<object>>

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
 * (filtered, optionally per group), the engine turns the counts into statistics.
 */
export async function runDatasetTest(dataset: Dataset, body: DigitTestRequestBody): Promise<TestResult> {
  if (dataset.status !== 'ready') throw fail(409, { message: 'This dataset is not ready yet: wait for its import to finish.' })
  const columns = await datasetColumns(dataset.id)
  const tested = columnByName(columns, body.column, 'column')
  if (!tested.numeric) throw fail(400, [{ path: 'column', message: `"${tested.name}" does not hold numbers. Choose an amount or count column.` }])
  if (body.groupBy && !isGroupable(body.test)) throw fail(400, [{ path: 'groupBy', message: 'Groups can be ranked for the digit tests and the summation test only.' }])
  const sign = body.sign ?? 'positive'
  const whole = buildDigitQuery(dataset.id, columns, tested, body.filters)
  const grouping = body.groupBy ? buildDigitQuery(dataset.id, columns, tested, body.filters, body.groupBy) : null
  const stored = await storedColumn(dataset.id, tested.position)
  const profile = suitabilityProfile(stored, whole, sign, Boolean(body.filters?.length))

  let counts: TestCountsMap[TestName]
  let groupCounts: Grouped<{ status: StatusCounts }> | null = null
  if (body.test in DISTRIBUTIONS) {
    // One scan answers both the status and the digit counts; with groups, the whole is their sum.
    // Unfiltered, the counts the import kept answer without a scan.
    const test = body.test as DistributionTest
    const groupPos = body.groupBy ? columnByName(columns, body.groupBy, 'groupBy').position : -1
    const scanned = !body.filters?.length && stored?.cubeGroups?.includes(groupPos)
      ? await cubeDistribution(test, dataset.id, tested.position, groupPos, sign)
      : await statusAndDistribution(test, grouping ?? whole, sign, Boolean(grouping))
    counts = grouping ? mergeGroups(scanned) : scanned.get(null) ?? { status: emptyStatus(), keys: [] }
    groupCounts = grouping ? scanned : null
  }
  else {
    const [status, byTest] = await Promise.all([statusCounts(whole, false), TEST_COUNTS[body.test](whole, sign, false, body.threshold)])
    counts = { status: status.get(null) ?? emptyStatus(), ...byTest.get(null) } as TestCountsMap[TestName]
    if (grouping) {
      const [byStatus, byCounts] = await Promise.all([statusCounts(grouping, true), TEST_COUNTS[body.test](grouping, sign, true)])
      groupCounts = new Map([...byStatus].map(([key, s]) => [key, { status: s, ...(byCounts.get(key) ?? { keys: [] }) }]))
    }
  }
  if (grouping && groupCounts) groupCounts = await decodeGroups(grouping, groupCounts)
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
