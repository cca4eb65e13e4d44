import { Readable } from 'node:stream'
import ExcelJS from 'exceljs'
import { describe, expect, it } from 'vitest'
import { openRows } from '../../server/services/datasets/readers'
import { detectEncoding } from '../../server/services/datasets/sniff'
import type { DatasetFormat } from '../../server/services/datasets/sniff'

/** Every row a stored file gives, read as the import reads it (encoding and BOM found by sniff.ts). */
async function rowsOf(format: DatasetFormat, bytes: Buffer) {
  const { encoding, bomLength } = format === 'xlsx' ? { encoding: 'utf-8' as const, bomLength: 0 } : detectEncoding(bytes)
  const open = async (start: number, end?: number) => Readable.from([bytes.subarray(start, end === undefined ? undefined : end + 1)])
  const source = openRows(format, { open, byteSize: bytes.length, sheet: null }, encoding, bomLength)
  const rows: string[][] = []
  for await (const batch of source.rows) rows.push(...batch)
  return { rows, meta: source.meta, bytesRead: source.bytesRead() }
}

describe('import readers', () => {
  it('reads CSV as RFC 4180 writes it: quoted commas, quotes and line breaks, CRLF rows, a UTF-8 BOM', async () => {
    const text = 'vendor,amount,note\r\n"Brindle & Pike, Ltd","1,234.50","said ""urgent"""\r\nCorvid Haulage,-77.10,"two\r\nlines"\r\nÉlan Signs,0,\r\n'
    const bytes = Buffer.concat([Buffer.from([0xEF, 0xBB, 0xBF]), Buffer.from(text, 'utf8')])
    const { rows, meta, bytesRead } = await rowsOf('csv', bytes)
    expect(rows).toEqual([
      ['vendor', 'amount', 'note'],
      ['Brindle & Pike, Ltd', '1,234.50', 'said "urgent"'],
      // Line ends become LF before parsing (so a file with CRLF rows, then LF rows, reads as rows), inside quotes too.
      ['Corvid Haulage', '-77.10', 'two\nlines'],
      ['Élan Signs', '0', ''],
    ])
    expect(meta.delimiter).toBe(',')
    expect(bytesRead).toBe(bytes.length - 3)
  })

  it('reads TSV with its tab delimiter and keeps commas inside cells', async () => {
    const { rows } = await rowsOf('tsv', Buffer.from('vendor\tamount\nQuay, Lighting\t1.234,50\n', 'utf8'))
    expect(rows).toEqual([['vendor', 'amount'], ['Quay, Lighting', '1.234,50']])
  })

  it('reads a UTF-16LE file with its BOM', async () => {
    const bytes = Buffer.concat([Buffer.from([0xFF, 0xFE]), Buffer.from('vendor;amount\nNæss;12,5\n', 'utf16le')])
    const { rows } = await rowsOf('csv', bytes)
    expect(rows).toEqual([['vendor', 'amount'], ['Næss', '12,5']])
  })

  it('reads JSON records with numbers as the file wrote them, the columns being the keys of the first records', async () => {
    const json = '[{"vendor":"Dunmore Signs","amount":12.50,"big":1e400},{"vendor":"Fallowmere","amount":-3,"extra":true}]'
    const { rows } = await rowsOf('json', Buffer.from(json, 'utf8'))
    expect(rows[0]).toEqual(['vendor', 'amount', 'big', 'extra'])
    expect(rows.slice(1)).toEqual([['Dunmore Signs', '12.50', '1e400', ''], ['Fallowmere', '-3', '', 'true']])
  })

  it('keeps the keys of a later record that are not among the columns, past them as "key: value"', async () => {
    // The columns are the keys of the first 1,000 records (readers.ts): record 1,001 brings two more.
    const first = Array.from({ length: 1000 }, (_, i) => ({ vendor: `Vendor ${i + 1}`, amount: `${i + 1}.00` }))
    const late = '{"note":"paid twice","vendor":"Late Vendor","amount":7,"batch":12.50,"void":null,"ref":{"run":4,"ids":[1.10,"2"]}}'
    const { rows } = await rowsOf('json', Buffer.from(`${JSON.stringify(first).slice(0, -1)},${late}]`, 'utf8'))
    expect(rows[0]).toEqual(['vendor', 'amount'])
    expect(rows[1000]).toEqual(['Vendor 1000', '1000.00'])
    // A nested value is JSON with its numbers as the file wrote them (1.10, not "1.10" nor 1.1).
    expect(rows[1001]).toEqual(['Late Vendor', '7', 'note: paid twice', 'batch: 12.50', 'void: ', 'ref: {"run":4,"ids":[1.10,"2"]}'])
  })

  it('reads an Excel workbook\'s first sheet, numbers as their decimal text', async () => {
    const workbook = new ExcelJS.Workbook()
    const sheet = workbook.addWorksheet('Payments')
    sheet.addRows([['vendor', 'amount'], ['Alderbank Works', 1234.5], ['Elsworth Paving', 0.1 + 0.2], ['Corvid Haulage', null]])
    const { rows } = await rowsOf('xlsx', Buffer.from(await workbook.xlsx.writeBuffer()))
    // Excel keeps 15 significant digits (Microsoft's documented limit), so 0.1 + 0.2 reads 0.3. A row
    // ends at its last cell; the import pads it to the header's width.
    expect(rows).toEqual([['vendor', 'amount'], ['Alderbank Works', '1234.5'], ['Elsworth Paving', '0.3'], ['Corvid Haulage']])
  })
})
