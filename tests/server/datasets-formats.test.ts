import { readFileSync } from 'node:fs'
import ExcelJS from 'exceljs'
import { beforeAll, describe, expect, it } from 'vitest'
import { PAYMENT_FILES, PAYMENT_KINDS, PAYMENTS } from '../fixtures/datasets/payments'
import { encoded, utf8 } from '../support/dataset-files'
import { allPages, sha256Of, uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let newsroom: TestNewsroom
beforeAll(async () => {
  newsroom = await createTestNewsroom('Formats desk')
})

describe('each upload format', () => {
  for (const [format, file] of Object.entries(PAYMENT_FILES)) {
    it(`imports ${format} with its rows, columns, kinds and the SHA-256 of the bytes sent`, async () => {
      const bytes = await file.bytes()
      const dataset = await uploadReady(newsroom.reporter, file.name, bytes)

      expect(dataset).toMatchObject({
        status: 'ready', format, rowCount: PAYMENTS.rows.length, raggedRows: 0, delimiter: file.delimiter,
        byteSize: bytes.length, originalName: file.name, error: null,
      })
      // Source: node:crypto over the very bytes the test sent.
      expect(dataset.sha256).toBe(sha256Of(bytes))
      expect(dataset.columns.map((c: any) => c.name)).toEqual(PAYMENTS.header)
      expect(dataset.columns.map((c: any) => c.kind)).toEqual(PAYMENT_KINDS)

      const { items } = await allPages(newsroom.reporter, `/api/datasets/${dataset.id}/preview`)
      expect(items.map(r => r.rowNo)).toEqual(PAYMENTS.rows.map((_, i) => i + 1))
      PAYMENTS.rows.forEach((row, i) => {
        const cells: string[] = items[i].cells
        // Text and dates come back as written (a workbook's date cell as its ISO day).
        expect(cells.slice(0, 3), `row ${i + 1}`).toEqual(row.slice(0, 3))
        // A workbook or JSON file stores 1250.50 as the number 1250.5: compare as numbers where the fixture has plain numbers.
        row.slice(3).forEach((cell, j) => {
          if (/^-?\d+(\.\d+)?$/.test(cell)) expect(Number(cells[3 + j]), `row ${i + 1} ${PAYMENTS.header[3 + j]}`).toBe(Number(cell))
          else expect(cells[3 + j]).toBe(cell)
        })
      })
    })
  }
})

// The literal fixture, UTF-8 without a BOM; every other encoding is made from it here.
const ACCENTS = readFileSync(new URL('../fixtures/datasets/accents.csv', import.meta.url), 'utf8')
// Written out by hand from accents.csv: what a reader of the file sees.
const ACCENT_ROWS = [
  ['Café Lumière', 'Brüggental', '£1,250.00'],
  ['Brûlerie Ève', 'Ørnvik', '£87.20'],
  ['Süßwaren Öhler', 'Vallée-Sorbe', '£512.09'],
]

describe('each text encoding', () => {
  const cases = [
    ['utf-8', 'utf-8'],
    ['utf-8-bom', 'utf-8'],
    ['utf-16le', 'utf-16le'],
    ['utf-16be', 'utf-16be'],
    // Latin-1 files are read as Windows-1252, its superset (sniff.ts); é, ü, £ are the same bytes in both.
    ['latin-1', 'windows-1252'],
  ] as const
  for (const [encoding, reported] of cases) {
    it(`reads ${encoding}: accents and the pound sign come through, the BOM does not`, async () => {
      const bytes = encoded(ACCENTS, encoding)
      const dataset = await uploadReady(newsroom.reporter, `accents-${encoding}.csv`, bytes)
      expect(dataset.encoding).toBe(reported)
      expect(dataset.sha256).toBe(sha256Of(bytes))
      expect(dataset.columns.map((c: any) => c.name)).toEqual(['supplier', 'town', 'amount'])
      const preview = await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview`)
      expect(preview.body.items.map((r: any) => r.cells)).toEqual(ACCENT_ROWS)
      // By hand: £1,250.00 = 1250, £87.20 = 87.2, £512.09: three amounts, none blank or unreadable.
      expect(dataset.columns[2]).toMatchObject({ kind: 'amount', parsed: 3, blank: 0, unreadable: 0, min: '87.2', max: '1250' })
    })
  }
})

describe('harder text files', () => {
  it('reads a Latin-1 file whose first accent comes after the part the importer samples', async () => {
    // 4,000 plain ASCII rows (about 110 KB, past sniff.ts's 64 KB sample), then one accented row.
    const plain = Array.from({ length: 4000 }, (_, i) => `Plain Vendor ${i + 1},${i + 1}.50`).join('\r\n')
    const bytes = encoded(`vendor,amount\r\n${plain}\r\nCafé Ærø,£12.00\r\n`, 'latin-1')
    expect(bytes.length).toBeGreaterThan(64 * 1024)
    const dataset = await uploadReady(newsroom.reporter, 'late-accents.csv', bytes)
    expect(dataset.encoding).toBe('windows-1252')
    expect(dataset.rowCount).toBe(4001)
    // Row 4001 is the first of page 81 at 50 rows a page.
    const page = await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview?page=81`)
    expect(page.body.items[0]).toEqual({ rowNo: 4001, cells: ['Café Ærø', '£12.00'] })
  })

  it('counts ragged rows, padding short ones', async () => {
    // By hand: row 2 has two cells and row 3 four, against a header of three.
    const dataset = await uploadReady(newsroom.reporter, 'ragged.csv', utf8('a,b,c\r\n1,2,3\r\n4,5\r\n6,7,8,9\r\n10,11,12\r\n'))
    expect(dataset).toMatchObject({ rowCount: 4, raggedRows: 2 })
    const preview = await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview`)
    expect(preview.body.items[1].cells).toEqual(['4', '5', ''])
  })
})

describe('workbook numbers', () => {
  it('reads them at Excel\'s 15 significant digits, not the binary leftovers the file stores', async () => {
    // Excel's documented number precision is 15 digits. The workbook keeps 0.1 + 0.2 as
    // 0.30000000000000004 and 1.1 × 100 as 110.00000000000001 (JavaScript writes the same doubles).
    const workbook = new ExcelJS.Workbook()
    const sheet = workbook.addWorksheet('Data')
    sheet.addRow(['vendor', 'amount'])
    sheet.addRow(['Sum Cell Ltd', 0.1 + 0.2])
    sheet.addRow(['Product Cell Ltd', 1.1 * 100])
    sheet.addRow(['Formula Cell Ltd', { formula: 'B2*3', result: (0.1 + 0.2) * 3 }])
    sheet.addRow(['Long Figure Ltd', 123456.789012345])
    const bytes = new Uint8Array(await workbook.xlsx.writeBuffer())
    const dataset = await uploadReady(newsroom.reporter, 'arithmetic.xlsx', bytes)
    const preview = await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview`)
    // By hand: 0.3, 110, 0.9 and the 15-digit figure as typed.
    expect(preview.body.items.map((r: any) => r.cells[1])).toEqual(['0.3', '110', '0.9', '123456.789012345'])
    expect(dataset.columns[1]).toMatchObject({ min: '0.3', max: '123456.789012345' })
  })
})
