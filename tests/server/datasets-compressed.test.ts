import { gzipSync } from 'node:zlib'
import ExcelJS from 'exceljs'
import { beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../support/api'
import { delimitedText } from '../support/dataset-files'
import { sha256Of, upload } from '../support/datasets'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { zipOf } from '../fixtures/hostile/generated'

// Issue 19: tables as official releases ship them (gzipped, or alone in a zip) import as the same
// rows as the plain file, the fingerprint being that of the bytes sent; a workbook's sheet is chosen.

let desk: TestNewsroom
let client: Client
const TABLE = { header: ['vendor', 'amount'], rows: [['Quayside Paving', '1840.00'], ['Lantern Row Supplies', '215.50'], ['Harbour Glaziers', '99.10']] }
const CSV = delimitedText(TABLE)

beforeAll(async () => {
  desk = await createTestNewsroom('Compressed desk')
  client = desk.reporter
})

async function uploaded(fileName: string, bytes: Uint8Array, fields: Record<string, string> = {}) {
  const reply = await upload(client, fileName, bytes, { title: fileName, ...fields }, `?newsroomId=${desk.id}`)
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  const dataset = (await client.get(`/api/datasets/${reply.body.id}`)).body
  const preview = (await client.get(`/api/datasets/${reply.body.id}/preview`)).body
  return { dataset, cells: preview.items.map((row: { cells: string[] }) => row.cells) }
}

describe('compressed tables', () => {
  it('reads a gzipped CSV as the CSV itself, fingerprinted as sent', async () => {
    const bytes = gzipSync(CSV)
    const { dataset, cells } = await uploaded('ledger.csv.gz', bytes)
    expect(dataset).toMatchObject({ status: 'ready', rowCount: 3, format: 'csv', compression: 'gzip', sha256: sha256Of(bytes) })
    expect(cells).toEqual(TABLE.rows)
  })

  it('reads the one table of a zip, passing over what archivers add beside it', async () => {
    const bytes = await zipOf({ 'release/payments.tsv': () => [delimitedText(TABLE, '\t')], '__MACOSX/release/._payments.tsv': () => ['resource fork'], 'release/.DS_Store': () => ['x'] })
    const { dataset, cells } = await uploaded('release.zip', bytes)
    expect(dataset).toMatchObject({ status: 'ready', rowCount: 3, format: 'tsv', compression: 'zip', archiveEntry: 'release/payments.tsv', sha256: sha256Of(bytes) })
    expect(cells).toEqual(TABLE.rows)
  })

  it('reads a gzipped JSON array of records', async () => {
    const json = JSON.stringify(TABLE.rows.map(([vendor, amount]) => ({ vendor, amount: Number(amount) })))
    const { dataset, cells } = await uploaded('ledger.json.gz', gzipSync(json))
    expect(dataset).toMatchObject({ rowCount: 3, format: 'json', compression: 'gzip' })
    expect(cells.map((row: string[]) => row[0])).toEqual(TABLE.rows.map(row => row[0]))
  })
})

describe('workbook sheets', () => {
  async function twoSheets(): Promise<Uint8Array> {
    const workbook = new ExcelJS.Workbook()
    workbook.addWorksheet('Read me', { state: 'hidden' }).addRows([['notes'], ['not data']])
    workbook.addWorksheet('2023').addRows([['vendor', 'amount'], ['Quayside Paving', 1840]])
    workbook.addWorksheet('2024').addRows([['vendor', 'amount'], ['Harbour Glaziers', 99.1], ['Mill Lane Timber', 310]])
    return new Uint8Array(await workbook.xlsx.writeBuffer())
  }

  it('reads the first visible sheet, lists them all, and reads a named one', async () => {
    const bytes = await twoSheets()
    const first = await uploaded('budget.xlsx', bytes)
    expect(first.dataset).toMatchObject({ sheet: null, sheets: ['Read me', '2023', '2024'], rowCount: 1 })
    expect(first.cells).toEqual([['Quayside Paving', '1840']])
    const named = await uploaded('budget.xlsx', bytes, { sheet: '2024' })
    expect(named.dataset).toMatchObject({ sheet: '2024', rowCount: 2 })
    expect(named.cells).toEqual([['Harbour Glaziers', '99.1'], ['Mill Lane Timber', '310']])
  })

  it('reads another sheet of a stored workbook into a new dataset without a new upload', async () => {
    const bytes = await twoSheets()
    const { dataset } = await uploaded('budget.xlsx', bytes)
    const reply = await client.post(`/api/datasets/${dataset.id}/sheets`, { sheet: '2024' })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    const other = (await client.get(`/api/datasets/${reply.body.id}`)).body
    expect(other).toMatchObject({ status: 'ready', sheet: '2024', rowCount: 2, sha256: sha256Of(bytes), title: 'budget.xlsx (2024)' })

    const missing = await client.post(`/api/datasets/${dataset.id}/sheets`, { sheet: '2031' })
    expect(missing.status).toBe(400)
    expect(missing.body.data).toEqual([{ path: 'sheet', message: 'This workbook has no sheet named "2031". Its sheets: "Read me", "2023", "2024".' }])
  })
})
