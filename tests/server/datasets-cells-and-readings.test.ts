import { beforeAll, describe, expect, it } from 'vitest'
import type { DatasetDTO } from '../../shared/types/dataset'
import { upload, waitUntilSettled } from '../support/datasets'
import { sql } from '../support/database'
import { utf8 } from '../support/dataset-files'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, saveBlock, writeStory } from '../support/stories'
import { QUAY_LEDGER } from '../fixtures/datasets/quay-ledger'

// Issue 19 and docs/product-rules.md ("Cell by cell", "Reading a column again"): the cells a test
// leaves out are listed by row with the file's text; ragged rows keep their extra cells; a column read
// again makes a new version and analysis blocks stay where they ran until moved.
// The hand-made ledger, row by row, is in tests/fixtures/datasets/quay-ledger.ts.

let desk: TestNewsroom
let other: TestNewsroom
let first: string

const cells = async (datasetId: string, query: string) => {
  const reply = await desk.reporter.get(`/api/datasets/${datasetId}/cells?${query}`)
  expectStatus(reply, 200)
  return reply.body
}
const described = async (id: string): Promise<DatasetDTO> => (await desk.reporter.get(`/api/datasets/${id}`)).body

beforeAll(async () => {
  desk = await createTestNewsroom('Cell by cell')
  other = await createTestNewsroom('Cell by cell, elsewhere')
  const reply = await upload(desk.reporter, 'quay-ledger.csv', utf8(QUAY_LEDGER), { title: 'Quay ledger' }, `?newsroomId=${desk.id}`)
  expectStatus(reply, 201)
  first = reply.body.id
})

describe('the cells a test leaves out', () => {
  it('lists unreadable, blank, zero and negative cells with their row numbers and the file\'s text', async () => {
    const column = (await described(first)).columns.find(c => c.name === 'amount')!
    expect(column).toMatchObject({ numeric: true, decimalMark: '.', unreadable: 3, blank: 1, zero: 1, negative: 1 })
    expect(await cells(first, 'column=amount&status=unreadable')).toMatchObject({
      total: 3, column: 'amount', items: [{ rowNo: 2, text: '93,19' }, { rowNo: 3, text: '1.337,69' }, { rowNo: 5, text: 'n/a' }],
    })
    expect((await cells(first, 'column=amount&status=blank')).items).toEqual([{ rowNo: 4, text: '' }])
    expect((await cells(first, 'column=amount&status=zero')).items).toEqual([{ rowNo: 8, text: '0' }])
    expect((await cells(first, 'column=amount&status=negative')).items).toEqual([{ rowNo: 6, text: '(250.00)' }])
  })

  it('lists the values outside one test\'s range: under 10 for the first-two-digits test', async () => {
    // docs/product-rules.md ("The analysis"): two leading digits exist only from 10 up.
    expect(await cells(first, 'column=amount&status=outside&test=first-two-digits')).toMatchObject({ total: 1, items: [{ rowNo: 7, text: '7.5' }] })
    const refused = await desk.reporter.get(`/api/datasets/${first}/cells?column=amount&status=outside`)
    expect(refused.status).toBe(400)
    expect(refused.body.data).toEqual([expect.objectContaining({ path: 'test' })])
  })

  it('pages the list', async () => {
    const second = await cells(first, 'column=amount&status=unreadable&page=2&pageSize=2')
    expect(second).toMatchObject({ page: 2, pageSize: 2, total: 3, items: [{ rowNo: 5, text: 'n/a' }] })
  })

  it('lists a text column\'s blank cells, and refuses statuses a text column has not', async () => {
    // Row 10 has no third cell: it is padded with a blank "paid on".
    expect((await cells(first, 'column=paid%20on&status=blank')).items).toEqual([{ rowNo: 10, text: '' }])
    expect((await desk.reporter.get(`/api/datasets/${first}/cells?column=supplier&status=unreadable`)).status).toBe(400)
  })

  it('downloads every such cell as CSV, with text a spreadsheet could run written inert', async () => {
    const response = await fetch(`${desk.reporter.base}/api/datasets/${first}/cells?column=amount&status=unreadable&format=csv`, { headers: { cookie: desk.reporter.cookie } })
    expect(response.status).toBe(200)
    expect(response.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(await response.text()).toBe('row,amount\r\n2,"93,19"\r\n3,"1.337,69"\r\n5,n/a\r\n')
    // OWASP's CSV-injection advice (shared/export/csv.ts): a cell starting with "=" gets an apostrophe.
    const formula = await upload(desk.reporter, 'formula.csv', utf8('payee,amount\r\nHarbour Cranes,=SUM(A1:A9)\r\nQuay Lighting,12.00\r\nWillow Drains,31.50\r\n'), { title: 'Formula ledger' }, `?newsroomId=${desk.id}`)
    expectStatus(formula, 201)
    const inert = await fetch(`${desk.reporter.base}/api/datasets/${formula.body.id}/cells?column=amount&status=unreadable&format=csv`, { headers: { cookie: desk.reporter.cookie } })
    expect(await inert.text()).toBe('row,amount\r\n1,\'=SUM(A1:A9)\r\n')
  })

  it('answers 404 to another newsroom, as for a dataset that does not exist', async () => {
    expect((await other.reporter.get(`/api/datasets/${first}/cells?column=amount&status=unreadable`)).status).toBe(404)
    expect((await other.reporter.get(`/api/datasets/${first}/ragged-rows`)).status).toBe(404)
    expect((await other.reporter.post(`/api/datasets/${first}/readings`, { columns: { amount: { decimalMark: ',' } } })).status).toBe(404)
  })
})

describe('ragged rows', () => {
  it('are kept whole: counted, listed by number with their cell count, and their extra cells shown', async () => {
    expect((await described(first)).raggedRows).toBe(2)
    const ragged = (await desk.reporter.get(`/api/datasets/${first}/ragged-rows`)).body
    expect(ragged).toMatchObject({ total: 2, width: 3, items: [{ rowNo: 9, cellCount: 5, extra: ['late entry', 'see memo'] }, { rowNo: 10, cellCount: 2, extra: [] }] })
    const preview = (await desk.reporter.get(`/api/datasets/${first}/preview`)).body
    const row = (n: number) => preview.items.find((r: { rowNo: number }) => r.rowNo === n)
    expect(row(9)).toEqual({ rowNo: 9, cells: ['Alder Fencing', '412.30', '11/02/2026'], cellCount: 5, extra: ['late entry', 'see memo'] })
    expect(row(10)).toEqual({ rowNo: 10, cells: ['Harbour Cranes', '2210.00', ''], cellCount: 2, extra: [] })
    expect(row(11)).toEqual({ rowNo: 11, cells: ['Quay Lighting', '318.40', '13/02/2026'] })
  })
})

describe('reading a column again', () => {
  let second: string

  it('makes a new version from the stored bytes, reading "93,19" and "1.337,69" as 93.19 and 1337.69 with a decimal comma', async () => {
    const before = await described(first)
    const reply = await desk.reporter.post(`/api/datasets/${first}/readings`, { columns: { 'amount': { decimalMark: ',' }, 'paid on': { dateOrder: 'mdy' } } })
    expectStatus(reply, 201)
    expect(reply.body).toMatchObject({ status: 'ready', readingNo: 2 })
    second = reply.body.id
    const version = await waitUntilSettled(desk.reporter, second) as DatasetDTO
    expect(version).toMatchObject({ sha256: before.sha256, byteSize: before.byteSize, title: 'Quay ledger', readingGroup: first, readingNo: 2, rowCount: 11 })
    expect(version.columnReadings).toEqual({ 'amount': { decimalMark: ',' }, 'paid on': { dateOrder: 'mdy' } })
    // Told its decimal mark, the column holds amounts however few of its cells now read.
    expect(version.columns.find(c => c.name === 'amount')).toMatchObject({ kind: 'amount', numeric: true, decimalMark: ',', parsed: 3, unreadable: 7 })
    const values = (await sql(`SELECT row_no, value::text FROM digit_records WHERE dataset_id = $1 AND column_pos = 1 AND status = 3 ORDER BY row_no`, [second])).rows
    expect(values).toEqual([{ row_no: 2, value: '93.19' }, { row_no: 3, value: '1337.69' }])
    // Read with a decimal comma, the cells written with a decimal point are the unreadable ones now.
    expect((await cells(second, 'column=amount&status=unreadable')).items.map((c: { rowNo: number }) => c.rowNo)).toEqual([1, 5, 6, 7, 9, 10, 11])
    // Month first, "13/02/2026" names no date; the order was told, so it is settled.
    expect(version.columns.find(c => c.name === 'paid on')!.dates).toMatchObject({ order: 'mdy', settled: true, unread: 1 })
  })

  it('leaves the version read from as it was, and lists the versions on both', async () => {
    const original = await described(first)
    expect(original.columns.find(c => c.name === 'amount')).toMatchObject({ decimalMark: '.', unreadable: 3 })
    expect(original.columnReadings).toEqual({})
    expect(original.readings.map(r => [r.id, r.readingNo])).toEqual([[first, 1], [second, 2]])
    expect((await described(second)).readings.map(r => r.id)).toEqual([first, second])
    expect((await sql(`SELECT count(*)::int AS n FROM digit_records WHERE dataset_id = $1 AND column_pos = 1 AND status = 3`, [first])).rows[0].n).toBe(6)
  })

  it('numbers a reading of a later version after the last one, and refuses a reading that changes nothing', async () => {
    const same = await desk.reporter.post(`/api/datasets/${second}/readings`, { columns: { 'amount': { decimalMark: ',' }, 'paid on': { dateOrder: 'mdy' } } })
    expect(same.status).toBe(400)
    const third = await desk.reporter.post(`/api/datasets/${second}/readings`, { columns: { amount: { kind: 'text' } } })
    expectStatus(third, 201)
    expect(third.body.readingNo).toBe(3)
    const text = await described(third.body.id)
    expect(text.columns.find(c => c.name === 'amount')).toMatchObject({ kind: 'text', numeric: false })
  })

  it('refuses readings that do not fit the column, naming the field', async () => {
    const reply = await desk.reporter.post(`/api/datasets/${first}/readings`, { columns: { 'supplier': { decimalMark: ',' }, 'amount': { dateOrder: 'dmy' }, 'no such column': { kind: 'count' } } })
    expect(reply.status).toBe(400)
    expect(reply.body.data.map((e: { path: string }) => e.path).sort()).toEqual(['columns.amount.dateOrder', 'columns.no such column', 'columns.supplier.decimalMark'])
  })

  it('keeps the later readings together when the first one is deleted', async () => {
    const made = await upload(desk.reporter, 'spare-ledger.csv', utf8(QUAY_LEDGER), { title: 'Spare ledger' }, `?newsroomId=${desk.id}`)
    expectStatus(made, 201)
    const two = (await desk.reporter.post(`/api/datasets/${made.body.id}/readings`, { columns: { amount: { decimalMark: ',' } } })).body.id
    const three = (await desk.reporter.post(`/api/datasets/${two}/readings`, { columns: { amount: { kind: 'text' } } })).body.id
    expectStatus(await desk.reporter.delete(`/api/datasets/${made.body.id}`), 200)
    for (const id of [two, three]) expect((await described(id)).readings.map(r => [r.id, r.readingNo])).toEqual([[two, 2], [three, 3]])
    // A reading made after that is numbered after the last one still kept.
    const four = await desk.reporter.post(`/api/datasets/${three}/readings`, { columns: { amount: { kind: 'amount' } } })
    expectStatus(four, 201)
    expect(four.body.readingNo).toBe(4)
  })

  it('lets a fact-checker read the versions but not make one (403)', async () => {
    expect((await desk['fact-checker'].post(`/api/datasets/${first}/readings`, { columns: { amount: { decimalMark: ',' } } })).status).toBe(403)
  })
})

describe('analysis blocks and versions', () => {
  it('keep the version they ran on until moved, and moving sends an approval back to unreviewed', async () => {
    const story = await writeStory(desk.reporter, desk.id, first)
    expectStatus(await desk['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    const reread = await desk.reporter.post(`/api/datasets/${first}/readings`, { columns: { amount: { negatives: 'parentheses', currency: 'Fr' } } })
    expectStatus(reread, 201)
    const kept = await blockOf(desk.reporter, story, story.analysisBlockId)
    expect(kept.settings.datasetId).toBe(first)
    expect(kept.review.status).toBe('approved')
    expectStatus(await saveBlock(desk.reporter, story, story.analysisBlockId, { settings: { ...story.settings, datasetId: reread.body.id } }), 200)
    const moved = await blockOf(desk.reporter, story, story.analysisBlockId)
    expect(moved.settings.datasetId).toBe(reread.body.id)
    expect(moved.review.status).toBe('unreviewed')
  })
})
