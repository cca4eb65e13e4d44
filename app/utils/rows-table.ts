import { BitSet, table as columnTable } from 'arquero'
import type { ColumnTable } from 'arquero'
import { readNumber, decimalText } from '#shared/digits'
import { inertText } from '#shared/export/csv'
import type { ColumnDTO, RowDTO } from '#shared/types/dataset'

/**
 * The rows behind a bin as an arquero table, searched, sorted, paged and written as CSV in the
 * browser. Only verbs that take ready values are used (a filter mask, a comparator): arquero's
 * expression verbs compile code at run time, which the Content-Security-Policy forbids.
 */
export const ROW_NUMBER = 'row'

export function rowsTable(columns: readonly ColumnDTO[], rows: readonly RowDTO[]): ColumnTable {
  const data: Record<string, unknown[]> = { [ROW_NUMBER]: rows.map(r => r.rowNo) }
  columns.forEach((column, i) => (data[column.name] = rows.map(r => r.cells[i] ?? '')))
  return columnTable(data)
}

/** A number cell's value for sorting (null when it reads as no number), read as the import read it. */
function sortValue(column: ColumnDTO | undefined, cell: string): number | string | null {
  if (!column?.numeric) return cell.trim().toLowerCase()
  const read = readNumber(cell, { decimalMark: column.decimalMark ?? '.' })
  return read.status === 'number' || read.status === 'zero' ? Number(decimalText(read)) : null
}

export interface RowsView {
  search: string
  sort: string | null
  dir: 'asc' | 'desc'
}

/** The rows holding the searched text in any cell (case ignored), in the order asked. */
export function viewRows(table: ColumnTable, columns: readonly ColumnDTO[], view: RowsView): ColumnTable {
  let result = table
  const needle = view.search.trim().toLowerCase()
  if (needle) {
    const mask = new BitSet(table.numRows())
    const getters = columns.map(c => table.getter(c.name))
    for (let row = 0; row < table.numRows(); row++) {
      if (getters.some(get => String(get(row)).toLowerCase().includes(needle))) mask.set(row)
    }
    result = result.create({ filter: mask })
  }
  if (view.sort) {
    const column = columns.find(c => c.name === view.sort)
    const get = table.getter(view.sort)
    const keys = new Map<number, number | string | null>()
    const key = (row: number) => {
      if (!keys.has(row)) keys.set(row, sortValue(column, String(get(row))))
      return keys.get(row)!
    }
    const sign = view.dir === 'desc' ? -1 : 1
    // Cells with no number go last either way; ties keep the file's order.
    result = result.create({
      order: (a: number, b: number) => {
        const [x, y] = [key(a), key(b)]
        if (x === null || y === null) return x === y ? a - b : x === null ? 1 : -1
        return (x < y ? -sign : x > y ? sign : 0) || a - b
      },
    })
  }
  return result
}

/** One page of a view, as the rows table draws them. A view's getters take positions in its own order. */
export function pageRows(view: ColumnTable, columns: readonly ColumnDTO[], page: number, size: number): RowDTO[] {
  const rowNo = view.getter(ROW_NUMBER)
  const getters = columns.map(c => view.getter(c.name))
  const from = (page - 1) * size
  return Array.from({ length: Math.max(0, Math.min(size, view.numRows() - from)) }, (_, i) => from + i)
    .map(at => ({ rowNo: Number(rowNo(at)), cells: getters.map(get => String(get(at))) }))
}

/**
 * The rows as CSV, after `#` lines saying which settings selected them, so the file says what it
 * holds once it leaves Mantissa. Texts a spreadsheet could run as formulas are written as text.
 */
export function rowsCsv(table: ColumnTable, about: readonly string[]): string {
  const format = Object.fromEntries(table.columnNames().map(name => [name, (value: unknown) => (typeof value === 'string' ? inertText(value) : value)]))
  return `${about.map(line => `# ${line.replace(/[\r\n]+/g, ' ')}\n`).join('')}${table.toCSV({ format })}`
}
