import { describe, expect, it } from 'vitest'
import type { ColumnDTO } from '#shared/types/dataset'
import { pageRows, rowsCsv, rowsTable, viewRows } from '../../app/utils/rows-table'

const column = (name: string, numeric: boolean, decimalMark: '.' | ',' | null = numeric ? '.' : null) => ({ name, numeric, decimalMark }) as ColumnDTO
const COLUMNS = [column('vendor', false), column('amount', true)]
// Amounts as a ledger writes them; their order by value is worked out by hand beside each case.
const ROWS = [['Corvid', '117,888.92'], ['alder', '1,463.70'], ['Brindle', '=146.78'], ['corvid works', '1,218.97'], ['Dunmore', '9.50'], ['Elsworth', '']]
  .map((cells, i) => ({ rowNo: i + 1, cells }))

describe('the rows behind a bin, in the browser', () => {
  const table = rowsTable(COLUMNS, ROWS)

  it('sorts a number column by value, cells without a number last, and a text column by its text', () => {
    const amounts = (dir: 'asc' | 'desc') => pageRows(viewRows(table, COLUMNS, { search: '', sort: 'amount', dir }), COLUMNS, 1, 10).map(r => r.cells[1])
    expect(amounts('asc')).toEqual(['9.50', '1,218.97', '1,463.70', '117,888.92', '=146.78', ''])
    expect(amounts('desc')).toEqual(['117,888.92', '1,463.70', '1,218.97', '9.50', '=146.78', ''])
    expect(pageRows(viewRows(table, COLUMNS, { search: '', sort: 'vendor', dir: 'asc' }), COLUMNS, 1, 3).map(r => r.rowNo)).toEqual([2, 3, 1])
  })

  it('finds rows holding a text in any cell, case ignored, and pages them', () => {
    const found = viewRows(table, COLUMNS, { search: 'CORVID', sort: null, dir: 'asc' })
    expect(pageRows(found, COLUMNS, 1, 10).map(r => r.rowNo)).toEqual([1, 4])
    expect(pageRows(found, COLUMNS, 2, 1).map(r => r.rowNo)).toEqual([4])
    expect(pageRows(found, COLUMNS, 3, 1)).toEqual([])
  })

  it('writes CSV after the lines that say what selected the rows, with formulas kept as text (OWASP CSV injection)', () => {
    const csv = rowsCsv(viewRows(table, COLUMNS, { search: 'brindle', sort: null, dir: 'asc' }), ['rows behind bin 1', 'only rows where\nvendor is x'])
    expect(csv).toBe('# rows behind bin 1\n# only rows where vendor is x\nrow,vendor,amount\n3,Brindle,\'=146.78\n')
  })
})
