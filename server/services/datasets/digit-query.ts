import { QueryTypes } from 'sequelize'
import { dayOfIso, periodOf } from '#shared/dates/read-date'
import type { Period } from '#shared/dates/read-date'
import type { DatasetFilter } from '#shared/schemas/dataset'
import type { ColumnDTO } from '#shared/types/dataset'
import { dictionaryOf } from './dictionary'

/** A text or date filter on a coded column, turned into the codes it keeps (or, negated, drops). */
export interface CodeFilter {
  position: number
  codes: number[]
  negate: boolean
}

/** How groups are read back: by the column's own texts, or by the period of its dates. */
export interface GroupDecoding {
  position: number
  /** Per period label, the codes of the dates in it; '' holds the texts that read as no date. */
  periods: Map<string, number[]> | null
}

/**
 * The FROM and WHERE of every count over one column's digit records, with the filters and the
 * grouping column. Only integers (column positions, codes the database gave) are written into the
 * SQL; every value a person typed travels as a bound replacement.
 */
export interface DigitQuery {
  from: string
  where: string
  group: string | null
  /** SQL that is true when the group equals the bound `:group` text (set by groupCondition). */
  groupEquals: string | null
  /** Set when `group` yields codes (or period numbers) that must be turned back into text. */
  decoding: GroupDecoding | null
  /** The filters as code sets, when every filter is one (the import's counts can then answer). */
  codeFilters: CodeFilter[] | null
  /**
   * Set when the filters are ranges of the tested column itself (taken together) beside code sets:
   * the value ladder (value-ladder.ts) can then answer, with `where` less those ranges in `besideRange`.
   */
  testedRange: { min?: number, max?: number, codeFilters: CodeFilter[], besideRange: string } | null
  replacements: { datasetId: string } & Record<string, unknown>
}

export function columnByName(columns: ColumnDTO[], name: string, path: string): ColumnDTO {
  const column = columns.find(c => c.name === name)
  if (!column) throw fail(400, [{ path, message: `There is no column named "${name}" in this dataset.` }])
  return column
}

/** A list of integers the database gave, as an SQL array literal. */
export function intArray(values: readonly number[]): string {
  return `'{${values.map(v => Math.trunc(v)).join(',')}}'::int[]`
}

/** SQL true when `expression` (a code) passes the filter. */
export function codeCondition(expression: string, filter: CodeFilter): string {
  const among = `${expression} = ANY(${intArray(filter.codes)})`
  return filter.negate ? `NOT (${among})` : among
}

async function codesOfValues(datasetId: string, position: number, values: string[]): Promise<number[]> {
  const { codeOf } = await dictionaryOf(datasetId, position)
  return [...new Set(values)].flatMap(value => (codeOf.has(value) ? [codeOf.get(value)!] : []))
}

function dateColumn(column: ColumnDTO, path: string): ColumnDTO {
  if (column.kind !== 'date') throw fail(400, [{ path, message: `"${column.name}" does not hold dates.` }])
  if (!column.dates || !column.coded) throw fail(400, [{ path, message: `The dates in "${column.name}" take too many different forms or values to be read at import, so they cannot be ranged or grouped by period.` }])
  return column
}

async function codesOfDays(datasetId: string, position: number, from?: string, to?: string): Promise<number[]> {
  const [low, high] = [from ? dayOfIso(from) : -Infinity, to ? dayOfIso(to) : Infinity]
  const codes: number[] = []
  if (low === null || high === null) return codes
  for (const [code, day] of (await dictionaryOf(datasetId, position)).dayOf) if (day !== null && day >= low && day <= high) codes.push(code)
  return codes
}

/** The codes of a date column by the period their day falls in ('' for texts that read as no date). */
async function periodsOf(datasetId: string, position: number, period: Period): Promise<Map<string, number[]>> {
  const periods = new Map<string, number[]>()
  for (const [code, day] of (await dictionaryOf(datasetId, position)).dayOf) {
    const label = day === null ? '' : periodOf(day, period)
    const list = periods.get(label)
    if (list) list.push(code)
    else periods.set(label, [code])
  }
  return periods
}

/** The grouping the request names, and how its groups read back. */
async function groupingOf(datasetId: string, columns: ColumnDTO[], groupBy: string, period: Period | undefined) {
  const column = columnByName(columns, groupBy, 'groupBy')
  if (period) {
    dateColumn(column, 'period')
    const periods = await periodsOf(datasetId, column.position, period)
    // Each code's period number (1, 2, …; 0 for no date), looked up in an array by the record's code.
    const labels = [...periods.keys()].filter(Boolean).sort()
    const numberOf: number[] = []
    labels.forEach((label, i) => periods.get(label)!.forEach(code => (numberOf[code] = i + 1)))
    const maxCode = Math.max(0, ...[...periods.values()].flat())
    const lookup = Array.from({ length: maxCode }, (_, i) => numberOf[i + 1] ?? 0)
    return { column, group: `coalesce((${intArray(lookup)})[d.group_codes[${column.position + 1}]], 0)`, needsRows: false, decoding: { position: column.position, periods } }
  }
  if (column.coded) return { column, group: `d.group_codes[${column.position + 1}]`, needsRows: false, decoding: { position: column.position, periods: null } }
  return { column, group: `btrim(r.cells[${column.position + 1}])`, needsRows: true, decoding: null }
}

export async function buildDigitQuery(
  datasetId: string,
  columns: ColumnDTO[],
  tested: ColumnDTO,
  filters: DatasetFilter[] = [],
  groupBy?: string,
  period?: Period,
): Promise<DigitQuery> {
  const joins: string[] = []
  const conditions = ['d.dataset_id = :datasetId', 'd.column_pos = :columnPos']
  const replacements: DigitQuery['replacements'] = { datasetId, columnPos: tested.position }
  const codeFilters: CodeFilter[] = []
  let allCoded = true
  let needsRows = false
  // The ranges of the tested column, apart from the other conditions (see testedRange).
  let range: { min?: number, max?: number } | null = null
  let ranged = true
  const rangeConditions = new Set<string>()
  for (const [i, filter] of filters.entries()) {
    const path = `filters.${i}.column`
    const column = columnByName(columns, filter.column, path)
    if (filter.op === 'between') {
      if (!column.numeric) throw fail(400, [{ path, message: `"${column.name}" does not hold numbers, so it has no range.` }])
      allCoded = false
      let target = 'd'
      if (column.position !== tested.position) {
        target = `f${i}`
        ranged = false
        joins.push(`JOIN digit_records ${target} ON ${target}.dataset_id = :datasetId AND ${target}.row_no = d.row_no AND ${target}.column_pos = ${column.position}`)
      }
      else {
        range ??= {}
        if (filter.min !== undefined && (range.min === undefined || filter.min > range.min)) range.min = filter.min
        if (filter.max !== undefined && (range.max === undefined || filter.max < range.max)) range.max = filter.max
      }
      const own = (condition: string) => {
        conditions.push(condition)
        if (target === 'd') rangeConditions.add(condition)
      }
      if (filter.min !== undefined) {
        own(`${target}.value >= :min${i}`)
        replacements[`min${i}`] = filter.min
      }
      if (filter.max !== undefined) {
        own(`${target}.value <= :max${i}`)
        replacements[`max${i}`] = filter.max
      }
      continue
    }
    if (column.numeric) throw fail(400, [{ path, message: `"${column.name}" holds numbers: give it a range instead.` }])
    if (filter.op === 'dates') {
      dateColumn(column, path)
      const codeFilter = { position: column.position, codes: await codesOfDays(datasetId, column.position, filter.from, filter.to), negate: false }
      codeFilters.push(codeFilter)
      conditions.push(codeCondition(`d.group_codes[${column.position + 1}]`, codeFilter))
      continue
    }
    const values = (filter.op === 'equals' ? [filter.value] : filter.values).map(v => v.trim())
    const negate = filter.op === 'not-one-of'
    if (column.coded) {
      const codeFilter = { position: column.position, codes: await codesOfValues(datasetId, column.position, values), negate }
      codeFilters.push(codeFilter)
      conditions.push(codeCondition(`d.group_codes[${column.position + 1}]`, codeFilter))
      continue
    }
    allCoded = false
    ranged = false
    needsRows = true
    conditions.push(`btrim(r.cells[${column.position + 1}]) ${negate ? 'NOT IN' : 'IN'} (:values${i})`)
    replacements[`values${i}`] = values
  }
  const grouping = groupBy ? await groupingOf(datasetId, columns, groupBy, period) : null
  if (grouping?.needsRows) needsRows = true
  if (needsRows) joins.unshift('JOIN dataset_rows r ON r.dataset_id = :datasetId AND r.row_no = d.row_no')
  return {
    from: `digit_records d ${joins.join(' ')}`,
    where: conditions.join(' AND '),
    group: grouping?.group ?? null,
    groupEquals: grouping ? groupEquals(grouping) : null,
    decoding: grouping?.decoding ?? null,
    codeFilters: allCoded ? codeFilters : null,
    testedRange: ranged && range && (range.min !== undefined || range.max !== undefined) && !grouping?.needsRows
      ? { ...range, codeFilters, besideRange: conditions.filter(c => !rangeConditions.has(c)).join(' AND ') }
      : null,
    replacements,
  }
}

function groupEquals(grouping: Awaited<ReturnType<typeof groupingOf>>): string {
  const codes = `d.group_codes[${grouping.column.position + 1}]`
  if (grouping.decoding?.periods) return `${codes} = ANY(CAST(:groupCodes AS int[]))`
  if (grouping.decoding) return `${codes} = (SELECT code FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = ${grouping.column.position} AND value = :group)`
  return `${grouping.group} = btrim(:group)`
}

/** The replacements that go with `groupEquals` for one group's text. */
export function groupReplacements(query: DigitQuery, group: string): Record<string, unknown> {
  const periods = query.decoding?.periods
  if (periods) return { groupCodes: `{${(periods.get(group) ?? []).join(',')}}` }
  return { group: query.decoding ? group.trim() : group }
}

/** Group keys as SQL gave them (codes or period numbers) back into the texts people read. */
export async function groupNames(datasetId: string, decoding: GroupDecoding): Promise<Map<string, string>> {
  if (decoding.periods) {
    const labels = [...decoding.periods.keys()].filter(Boolean).sort()
    return new Map([['0', ''], ...labels.map((label, i) => [String(i + 1), label] as [string, string])])
  }
  return (await dictionaryOf(datasetId, decoding.position)).valueOf
}

/** Turns group codes back into the column's text (or period), keeping every group's counts. */
export async function decodeGroups<T>(query: DigitQuery, groups: Map<string | null, T>): Promise<Map<string | null, T>> {
  if (!query.decoding) return groups
  const byCode = await groupNames(query.replacements.datasetId as string, query.decoding)
  return new Map([...groups].map(([code, value]) => [code === null ? null : byCode.get(String(code)) ?? '', value]))
}

/** Runs a SELECT over the query's rows; `extra` adds conditions, `select` and `groupBy` the rest. */
export function selectRows<T extends object>(
  query: DigitQuery,
  parts: { select: string, extra?: string, groupBy?: string, tail?: string, grouped?: boolean },
  replacements: Record<string, unknown> = {},
): Promise<T[]> {
  const grouped = parts.grouped && query.group
  const select = grouped ? `${query.group} AS grp, ${parts.select}` : parts.select
  const where = parts.extra ? `${query.where} AND ${parts.extra}` : query.where
  const groupList = [grouped ? 'grp' : null, parts.groupBy].filter(Boolean).join(', ')
  const sql = `SELECT ${select} FROM ${query.from} WHERE ${where}${groupList ? ` GROUP BY ${groupList}` : ''}${parts.tail ? ` ${parts.tail}` : ''}`
  return rawSelect<T>(sql, { ...query.replacements, ...replacements })
}

/**
 * A SELECT over one dataset's data with bound replacements, answering plain rows; it may run on a
 * read replica (datasetReader), so it never writes.
 */
export async function rawSelect<T extends object>(sql: string, replacements: { datasetId: string } & Record<string, unknown>): Promise<T[]> {
  return (await datasetReader(replacements.datasetId)).query<T>(sql, { replacements, type: QueryTypes.SELECT })
}
