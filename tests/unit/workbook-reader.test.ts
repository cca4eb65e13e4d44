import { Readable } from 'node:stream'
import ExcelJS from 'exceljs'
import { describe, expect, it } from 'vitest'
import { WORKBOOK_LIMITS, workbookRows, workbookSheets } from '../../server/services/datasets/workbook'
import { MEGABYTE, cellTextBomb, craftedWorkbook, manyRowsWorkbook, sharedTextBomb, sheetOf } from '../fixtures/hostile/generated'

// Workbooks written by another program (exceljs, an independent .xlsx writer) must read back as the
// cells it was given; archives written with yazl (a general zip writer) stand in for crafted files.

const opener = (bytes: Buffer) => async (start: number, end?: number) => Readable.from([bytes.subarray(start, end === undefined ? undefined : end + 1)])

async function rowsOf(bytes: Buffer, sheet: string | null = null): Promise<string[][]> {
  const rows: string[][] = []
  for await (const batch of workbookRows(opener(bytes), bytes.length, sheet, () => {})) rows.push(...batch)
  return rows
}

async function failureOf(bytes: Buffer, sheet: string | null = null): Promise<Error> {
  try {
    await rowsOf(bytes, sheet)
  }
  catch (error) {
    return error as Error
  }
  throw new Error('the workbook was read')
}

async function excelWorkbook(build: (workbook: ExcelJS.Workbook) => void): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook()
  build(workbook)
  return Buffer.from(await workbook.xlsx.writeBuffer())
}

describe('reading workbooks written by a spreadsheet writer', () => {
  it('reads text, numbers, dates, booleans, formulas and blanks as a spreadsheet shows them', async () => {
    const bytes = await excelWorkbook((workbook) => {
      const sheet = workbook.addWorksheet('Payments')
      sheet.addRow(['vendor', 'amount', 'paid on', 'approved', 'doubled'])
      sheet.addRow(['Quayside Paving', 1840.5, new Date('2024-03-05T00:00:00Z'), true, { formula: 'B2*2', result: 3681 }])
      sheet.addRow(['Lantern Row Supplies', 0.1 + 0.2, null, false, { formula: 'B3*2' }])
      sheet.addRow([{ richText: [{ text: 'Harbour ' }, { font: { bold: true }, text: 'Glaziers' }] }, 1e21, new Date('2024-03-05T13:30:00Z'), null, { formula: '1/0', result: { error: '#DIV/0!' } }])
    })
    expect(await rowsOf(bytes)).toEqual([
      ['vendor', 'amount', 'paid on', 'approved', 'doubled'],
      ['Quayside Paving', '1840.5', '2024-03-05', 'TRUE', '3681'],
      // 0.1 + 0.2 is stored as 0.30000000000000004; Excel shows 15 significant digits.
      ['Lantern Row Supplies', '0.3', '', 'FALSE', '=B3*2'],
      ['Harbour Glaziers', '1000000000000000000000', '2024-03-05T13:30:00.000Z', '', '#DIV/0!'],
    ])
  })

  it('reads the first visible sheet unless another is named, and lists the sheets', async () => {
    const bytes = await excelWorkbook((workbook) => {
      workbook.addWorksheet('Notes', { state: 'hidden' }).addRow(['read me first'])
      workbook.addWorksheet('2023').addRow(['amount', 10])
      workbook.addWorksheet('2024').addRow(['amount', 20])
    })
    expect(await workbookSheets(opener(bytes), bytes.length)).toEqual([
      { name: 'Notes', hidden: true }, { name: '2023', hidden: false }, { name: '2024', hidden: false },
    ])
    expect(await rowsOf(bytes)).toEqual([['amount', '10']])
    expect(await rowsOf(bytes, '2024')).toEqual([['amount', '20']])
    expect((await failureOf(bytes, '2025')).message).toBe('This workbook has no sheet named "2025". Its sheets: "Notes", "2023", "2024".')
  })

  it('reads the shared strings first even when the archive keeps the sheet before them', async () => {
    const bytes = await craftedWorkbook({
      sheetFirst: true,
      sheet: sheetOf(() => ['<row r="1"><c r="A1" t="s"><v>1</v></c><c r="C1" t="inlineStr"><is><t>inline</t></is></c></row>']),
      strings: () => ['<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><si><t>zero</t></si><si><r><t>o</t></r><r><t>ne</t></r><rPh><t>guide</t></rPh></si></sst>'],
    })
    expect(await rowsOf(bytes)).toEqual([['one', '', 'inline']])
  })
})

describe('crafted workbooks are refused before they exhaust the server', () => {
  const refusal = /larger than any spreadsheet program writes/

  it('refuses shared text that inflates past its limit, without holding it', async () => {
    const bytes = await sharedTextBomb(WORKBOOK_LIMITS.sharedStringBytes / MEGABYTE + 2)
    expect(bytes.length).toBeLessThan(MEGABYTE) // a small upload...
    const before = process.memoryUsage().rss
    expect((await failureOf(bytes)).message).toMatch(refusal) // ...that would inflate to over 64 MB
    expect(process.memoryUsage().rss - before).toBeLessThan(WORKBOOK_LIMITS.sharedStringBytes * 3)
  })

  it('refuses one cell of more text than a spreadsheet cell holds', async () => {
    expect((await failureOf(await cellTextBomb(64))).message).toMatch(refusal)
  })

  it('refuses more rows than a sheet can have', async () => {
    const error = await failureOf(await manyRowsWorkbook(WORKBOOK_LIMITS.rows + 1))
    expect(error.message).toMatch(refusal)
    expect(error.message).toMatch(/number of rows/)
  }, 120_000)

  it('refuses a cell beyond the last column a sheet can have', async () => {
    const bytes = await craftedWorkbook({ sheet: sheetOf(() => ['<row r="1"><c r="XFE1"><v>1</v></c></row>']) })
    expect((await failureOf(bytes)).message).toMatch(/number of columns/)
  })

  it('refuses an archive of more parts than a workbook has', async () => {
    const bytes = await craftedWorkbook({ sheet: sheetOf(() => []), extraEntries: WORKBOOK_LIMITS.entries })
    expect((await failureOf(bytes)).message).toMatch(/list of parts/)
  })

  it('refuses a part whose inflated bytes disagree with the size its directory gives', async () => {
    const bytes = await craftedWorkbook({ sheet: sheetOf(() => ['<row r="1"><c r="A1"><v>12</v></c></row>']) })
    // The central directory's uncompressed size of the last entry (the sheet) made smaller than the truth.
    const directory = bytes.lastIndexOf(Buffer.from('xl/worksheets/sheet1.xml')) - 46
    expect(bytes.readUInt32LE(directory)).toBe(0x02014B50)
    bytes.writeUInt32LE(5, directory + 24)
    expect((await failureOf(bytes)).message).toMatch(/cannot be read/)
  })
})
