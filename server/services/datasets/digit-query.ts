import { QueryTypes } from 'sequelize'
import type { DatasetFilter } from '#shared/schemas/dataset'
import type { ColumnDTO } from '#shared/types/dataset'

/**
 * The FROM and WHERE of every count over one column's digit records, with the filters and the
 * grouping column. Only integers (column positions) are written into the SQL; every value a
 * person typed travels as a bound replacement.
 */
export interface DigitQuery {
  from: string
  where: string
  group: string | null
  /** SQL that is true when the group equals the bound `:group` text. */
  groupEquals: string | null
  /** Set when `group` yields codes that must be turned back into the column's text. */
  groupCodesOf: number | null
  replacements: { datasetId: string } & Record<string, unknown>
}

/** The code of a text in a coded column, or NULL: compares one integer per record instead of joining the rows. */
function codeOf(position: number, parameter: string) {
  return `(SELECT code FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = ${position} AND value = :${parameter})`
}

export function columnByName(columns: ColumnDTO[], name: string, path: string): ColumnDTO {
  const column = columns.find(c => c.name === name)
  if (!column) throw fail(400, [{ path, message: `There is no column named "${name}" in this dataset.` }])
  return column
}

export function buildDigitQuery(
  datasetId: string,
  columns: ColumnDTO[],
  tested: ColumnDTO,
  filters: DatasetFilter[] = [],
  groupBy?: string,
): DigitQuery {
  const joins: string[] = []
  const conditions = ['d.dataset_id = :datasetId', 'd.column_pos = :columnPos']
  const replacements: DigitQuery['replacements'] = { datasetId, columnPos: tested.position }
  let needsRows = false
  filters.forEach((filter, i) => {
    const column = columnByName(columns, filter.column, `filters.${i}.column`)
    if (filter.op === 'equals') {
      if (column.coded) {
        conditions.push(`d.group_codes[${column.position + 1}] = ${codeOf(column.position, `filter${i}`)}`)
        replacements[`filter${i}`] = filter.value.trim()
        return
      }
      needsRows = true
      conditions.push(`btrim(r.cells[${column.position + 1}]) = btrim(:filter${i})`)
      replacements[`filter${i}`] = filter.value
      return
    }
    if (!column.numeric) throw fail(400, [{ path: `filters.${i}.column`, message: `"${column.name}" does not hold numbers, so it has no range.` }])
    let target = 'd'
    if (column.position !== tested.position) {
      target = `f${i}`
      joins.push(`JOIN digit_records ${target} ON ${target}.dataset_id = :datasetId AND ${target}.row_no = d.row_no AND ${target}.column_pos = ${column.position}`)
    }
    if (filter.min !== undefined) {
      conditions.push(`${target}.value >= :min${i}`)
      replacements[`min${i}`] = filter.min
    }
    if (filter.max !== undefined) {
      conditions.push(`${target}.value <= :max${i}`)
      replacements[`max${i}`] = filter.max
    }
  })
  let group: string | null = null
  let groupEquals: string | null = null
  let groupCodesOf: number | null = null
  if (groupBy) {
    const column = columnByName(columns, groupBy, 'groupBy')
    if (column.coded) {
      group = `d.group_codes[${column.position + 1}]`
      groupEquals = `${group} = ${codeOf(column.position, 'group')}`
      groupCodesOf = column.position
    }
    else {
      needsRows = true
      group = `btrim(r.cells[${column.position + 1}])`
      groupEquals = `${group} = btrim(:group)`
    }
  }
  if (needsRows) joins.unshift('JOIN dataset_rows r ON r.dataset_id = :datasetId AND r.row_no = d.row_no')
  return { from: `digit_records d ${joins.join(' ')}`, where: conditions.join(' AND '), group, groupEquals, groupCodesOf, replacements }
}

/** Turns group codes back into the column's text, keeping every group's counts. */
export async function decodeGroups<T>(query: DigitQuery, groups: Map<string | null, T>): Promise<Map<string | null, T>> {
  if (query.groupCodesOf === null) return groups
  const names = await rawSelect<{ code: number, value: string }>(
    'SELECT code, value FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = :position',
    { datasetId: query.replacements.datasetId, position: query.groupCodesOf },
  )
  const byCode = new Map(names.map(n => [String(n.code), n.value]))
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
  const groupList = [grouped ? query.group : null, parts.groupBy].filter(Boolean).join(', ')
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
