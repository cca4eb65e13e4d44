import { byDistribution, DISTRIBUTIONS, decimalToText, thresholdBand } from '#shared/digits'
import type { DistributionTest, TestName } from '#shared/digits'
import type { Period } from '#shared/dates/read-date'
import type { DatasetFilter } from '#shared/schemas/dataset'
import type { PageDTO, RowDTO } from '#shared/types/dataset'
import type { Dataset } from '../../models'
import { datasetColumns } from './catalog'
import { FIELD_COLUMNS, numbersOfSign } from './digit-columns'
import { buildDigitQuery, columnByName, groupReplacements, rawSelect } from './digit-query'
import { cubeBinCount } from './digit-tests'

export const PAGE_SIZE = 50

function readyOrConflict(dataset: Dataset) {
  if (dataset.status !== 'ready') throw fail(409, { message: 'This dataset is not ready yet: wait for its import to finish.' })
}

/** The rows of the dataset, a page at a time, in file order or sorted by one column. */
export async function previewRows(dataset: Dataset, page: number, sort?: string, dir: 'asc' | 'desc' = 'asc'): Promise<PageDTO<RowDTO>> {
  readyOrConflict(dataset)
  const columns = await datasetColumns(dataset.id)
  let join = ''
  let order = 'r.row_no'
  if (sort) {
    const column = columnByName(columns, sort, 'sort')
    if (column.numeric) {
      join = `LEFT JOIN digit_records s ON s.dataset_id = :datasetId AND s.row_no = r.row_no AND s.column_pos = ${column.position}`
      order = `s.value ${dir} NULLS LAST, r.row_no`
    }
    else order = `r.cells[${column.position + 1}] ${dir}, r.row_no`
  }
  const items = await rawSelect<RowDTO>(
    `SELECT r.row_no AS "rowNo", r.cells FROM dataset_rows r ${join} WHERE r.dataset_id = :datasetId ORDER BY ${order} LIMIT ${PAGE_SIZE} OFFSET :offset`,
    { datasetId: dataset.id, offset: (page - 1) * PAGE_SIZE },
  )
  return { page, pageSize: PAGE_SIZE, total: dataset.rowCount ?? 0, items }
}

export interface DrillDown {
  test: TestName
  column: string
  key: string
  page: number
  pageSize?: number
  sign?: 'positive' | 'negative'
  threshold?: number
  filters?: DatasetFilter[]
  groupBy?: string
  period?: Period
  group?: string
}

interface BinRule {
  /** The distribution whose keys are the test's bins: the import counted them, so a total needs no scan. */
  distribution?: DistributionTest
  /** The condition that picks a bin's values, or null when `key` is no bin of the test. */
  condition: (key: string, threshold?: number) => { sql: string, values: Record<string, unknown> } | null
}

const distributionBins = (distribution: DistributionTest): BinRule => ({
  distribution,
  condition: (key) => {
    const definition = DISTRIBUTIONS[distribution]
    return definition.keys.includes(key) ? { sql: `d.${FIELD_COLUMNS[definition.field]} = :key`, values: { key: Number(key) } } : null
  },
})

/** How each test's bins pick rows; keys are validated here, never written into SQL. A new test is a type error until it has its rule. */
const BINS: Record<TestName, BinRule> = {
  ...byDistribution(distributionBins),
  'summation': distributionBins('first-two-digits'),
  'duplicates': { condition: key => /^-?\d+(\.\d+)?$/.test(key) ? { sql: 'd.value = CAST(:key AS numeric)', values: { key } } : null },
  'round-numbers': {
    condition: key => /^0{1,3}$/.test(key) ? { sql: `d.integer_digits >= 2 AND d.fraction_digits = 0 AND d.trailing_zeros >= ${key.length}`, values: {} } : null,
  },
  'threshold': {
    condition: (key, threshold) => {
      if (!threshold || !/^\d+(\.\d+)?$/.test(key)) return null
      const width = decimalToText(thresholdBand({ limit: threshold }).width)
      return { sql: 'abs(d.value) >= CAST(:key AS numeric) AND abs(d.value) < CAST(:key AS numeric) + CAST(:width AS numeric)', values: { key, width } }
    },
  },
}

function binCondition(test: TestName, key: string, threshold?: number) {
  const condition = BINS[test].condition(key, threshold)
  if (!condition) throw fail(400, [{ path: 'key', message: `"${key}" is not a bin of the ${test} test.` }])
  return condition
}

/** The rows behind one bin of a test (and one group), a page at a time. */
export async function binRows(dataset: Dataset, request: DrillDown): Promise<PageDTO<RowDTO> & { column: string, key: string }> {
  readyOrConflict(dataset)
  const columns = await datasetColumns(dataset.id)
  const tested = columnByName(columns, request.column, 'column')
  if (!tested.numeric) throw fail(400, [{ path: 'column', message: `"${tested.name}" does not hold numbers.` }])
  const query = await buildDigitQuery(dataset.id, columns, tested, request.filters, request.groupBy, request.period)
  const bin = binCondition(request.test, request.key, request.threshold)
  let where = `${query.where} AND ${numbersOfSign(request.sign ?? 'positive')} AND ${bin.sql}`
  const pageSize = request.pageSize ?? PAGE_SIZE
  const replacements: typeof query.replacements = { ...query.replacements, ...bin.values, offset: (request.page - 1) * pageSize, limit: pageSize }
  if (query.groupEquals && request.group !== undefined) {
    where += ` AND ${query.groupEquals}`
    Object.assign(replacements, groupReplacements(query, request.group))
  }
  // The bin's row numbers first, then only that page's rows: joining every record to its row
  // before choosing the page costs a lookup per record. Unfiltered, the import's counts give the total.
  const distribution = BINS[request.test].distribution
  const groupColumn = request.groupBy && request.group !== undefined && !request.period ? columnByName(columns, request.groupBy, 'groupBy') : null
  const [items, counted] = await Promise.all([
    rawSelect<RowDTO>(`SELECT r.row_no AS "rowNo", r.cells
      FROM (SELECT d.row_no FROM ${query.from} WHERE ${where} ORDER BY d.row_no LIMIT :limit OFFSET :offset) hit
      JOIN dataset_rows r ON r.dataset_id = :datasetId AND r.row_no = hit.row_no ORDER BY r.row_no`, replacements),
    distribution && !request.filters?.length && !(request.period && request.group !== undefined)
      ? cubeBinCount(dataset.id, tested, { test: distribution, key: Number(request.key), sign: request.sign ?? 'positive' }, groupColumn ? { column: groupColumn, value: request.group! } : undefined)
      : null,
  ])
  const total = counted ?? (await rawSelect<{ total: number }>(`SELECT count(*)::int AS total FROM ${query.from} WHERE ${where}`, replacements))[0]?.total ?? 0
  return { page: request.page, pageSize, total, items, column: tested.name, key: request.key }
}
