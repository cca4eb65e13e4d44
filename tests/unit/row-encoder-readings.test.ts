import { describe, expect, it } from 'vitest'
import { RowEncoder } from '../../server/services/datasets/row-encoder'
import { STATUS_CODES } from '../../server/services/datasets/digit-columns'
import { DIGIT_COLUMNS } from '../../server/services/datasets/copy-encoder'
import { array, copyRows, int2, int4, numeric, text } from '../support/copy-decoder'

// The import's encoder, told how to read columns (docs/product-rules.md, "Reading a column again")
// and given ragged rows ("Cell by cell"). Its COPY bytes are read back with the decoder written from
// PostgreSQL's documentation of the binary format (tests/support/copy-decoder.ts).

const ID = '00000000-0000-4000-8000-000000000019'
const HEADER = ['supplier', 'amount', 'paid on']
// Invented rows: the amounts use a decimal comma, the dates put the month first.
const ROWS = [
  ['Quay Lighting', '93,19', '02/13/2026'],
  ['Willow Drains', '1.337,69', '02/14/2026'],
  ['Alder Fencing', '(12,00)', '03/01/2026'],
  ['Harbour Cranes', '-5,00', '03/02/2026'],
]

function encode(readings = {}, ragged: [number, { cellCount: number, extra: string[] }][] = []) {
  const encoder = new RowEncoder(ID, HEADER, readings)
  encoder.add(ROWS.flat(), ROWS.length, ragged)
  const { rows, digits, encoded } = encoder.finish()
  return { rows: copyRows(Buffer.concat(rows)), digits: copyRows(Buffer.concat(digits)), encoded }
}

describe('column readings told after an import', () => {
  it('reads a decimal comma, one way of writing negatives and a date order as told', () => {
    const { digits, encoded } = encode({ 'amount': { decimalMark: ',', negatives: 'parentheses' }, 'paid on': { dateOrder: 'mdy' } })
    const field = (row: (Buffer | null)[], name: string) => row[DIGIT_COLUMNS.indexOf(name)]!
    const amounts = digits.filter(row => int2(field(row, 'column_pos')) === 1)
    expect(amounts.map(row => [int4(field(row, 'row_no')), int2(field(row, 'status')), numeric(field(row, 'value'))])).toEqual([
      // Values are stored as their exact decimal, without trailing zeros: (12,00) is -12.
      [1, STATUS_CODES.number, '93.19'], [2, STATUS_CODES.number, '1337.69'], [3, STATUS_CODES.number, '-12'],
      // "-5,00" has a leading minus, which this column does not use: unreadable, and so listed.
      [4, STATUS_CODES.unreadable, null],
    ])
    const [, amount, paidOn] = encoded.columns
    expect(amount).toMatchObject({ decimalMark: ',', unreadable: 1, negative: 1 })
    expect(paidOn!.dates).toMatchObject({ order: 'mdy', settled: true, read: 4, unread: 0, first: '2026-02-13', last: '2026-03-02' })
  })

  it('reads a column told to be text as text, and one told to be an amount as numbers', () => {
    const { encoded } = encode({ amount: { kind: 'text' }, supplier: { kind: 'amount' } })
    expect(encoded.columns.map(c => [c.name, c.kind, c.decimalMark])).toEqual([['supplier', 'amount', '.'], ['amount', 'text', null], ['paid on', 'date', null]])
    expect(encoded.columns[0]!.unreadable).toBe(4)
  })

  it('keeps a ragged row\'s cell count and the cells past the header', () => {
    const { rows } = encode({}, [[1, { cellCount: 5, extra: ['late entry', 'see memo'] }], [3, { cellCount: 2, extra: [] }]])
    expect(rows.map(row => [int4(row[0]!), array(row[1]!, text), row[2] ? int4(row[2]) : null, row[3] ? array(row[3], text) : null])).toEqual([
      [1, ROWS[0], null, null],
      [2, ROWS[1], 5, ['late entry', 'see memo']],
      [3, ROWS[2], null, null],
      [4, ROWS[3], 2, null],
    ])
  })
})
