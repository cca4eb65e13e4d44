import { beforeAll, describe, expect, it } from 'vitest'
import type { DatasetDTO } from '../../shared/types/dataset'
import { upload, uploadReady, waitUntilSettled } from '../support/datasets'
import { delimitedText, utf8 } from '../support/dataset-files'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { expectStatus } from '../support/stories'

// Issue 19 ("What done looks like": every column's left-out cells listed; nothing a file held dropped).
// A date column's cells that name no date are listed by row with the file's text; a JSON record's keys
// that are not among the columns are kept and listed. The expected cells are worked out here by a
// reading of our own, not by the app's date reader: the fixture writes dates in two forms only
// (DD/MM/YYYY and YYYY-MM-DD), and a day exists when JavaScript's Date (the proleptic Gregorian
// calendar of ECMA-262, §21.4.1) gives back the same year, month and day for it.

type Order = 'dmy' | 'mdy'

/** Whether a cell of the fixture names a day, read in `order` for the slashed form. */
function namesDay(cell: string, order: Order): boolean {
  const text = cell.trim()
  const iso = /^(\d{4})-(\d{2})-(\d{2})( \d{2}:\d{2})?$/.exec(text)
  const slashed = /^(\d{2})\/(\d{2})\/(\d{4})$/.exec(text)
  let parts: [number, number, number]
  if (iso) parts = [Number(iso[1]), Number(iso[2]), Number(iso[3])]
  else if (slashed) {
    const [a, b, year] = [Number(slashed[1]), Number(slashed[2]), Number(slashed[3])]
    parts = order === 'dmy' ? [year, b, a] : [year, a, b]
  }
  else return false
  const [year, month, day] = parts
  const date = new Date(Date.UTC(year, month - 1, day))
  return date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day
}

const two = (n: number) => String(n).padStart(2, '0')
/** Row i (from 1): a payment date, mostly DD/MM/YYYY with days past 12 (so day first is settled), and the odd cell that is no date. */
function paidOn(i: number): string {
  if (i % 59 === 0) return 'TBC'
  if (i % 41 === 0) return '30/02/2026' // February has no 30th
  if (i % 67 === 0) return ''
  if (i % 83 === 0) return '2026-02-29' // 2026 is no leap year
  if (i % 97 === 0) return '2026-03-15'
  if (i % 71 === 0) return `  ${two(1 + (i % 28))}/${two(1 + (i % 12))}/2026 `
  if (i === 89) return '=NOW()'
  return `${two(1 + ((i * 11) % 28))}/${two(1 + (i % 12))}/2026`
}
/** Row i: a time the entry was logged, with a time of day; a few of them name no day. */
function loggedAt(i: number): string {
  if (i % 53 === 0) return `2026-02-30 ${two(i % 24)}:15`
  if (i % 61 === 0) return 'soon'
  return `2026-${two(1 + (i % 12))}-${two(1 + (i % 28))} ${two(i % 24)}:${two(i % 60)}`
}
const ROWS = Array.from({ length: 420 }, (_, n) => {
  const i = n + 1
  return [`Supplier ${i % 17}`, `${(i * 37.5).toFixed(2)}`, paidOn(i), loggedAt(i)]
})
const unreadRows = (column: number, order: Order) => ROWS.flatMap((row, n) => (row[column]!.trim() && !namesDay(row[column]!, order) ? [{ rowNo: n + 1, text: row[column]! }] : []))

let desk: TestNewsroom
let ledger: DatasetDTO
const cells = async (datasetId: string, query: string) => {
  const reply = await desk.reporter.get(`/api/datasets/${datasetId}/cells?${query}`)
  expectStatus(reply, 200)
  return reply.body
}
/** Every page of a list, one after another. */
async function everyCell(datasetId: string, query: string) {
  const all: { rowNo: number, text: string }[] = []
  for (let page = 1; ; page++) {
    const reply = await cells(datasetId, `${query}&page=${page}&pageSize=7`)
    all.push(...reply.items)
    if (page * reply.pageSize >= reply.total) return { total: reply.total, items: all }
  }
}

beforeAll(async () => {
  desk = await createTestNewsroom('Dates cell by cell')
  ledger = await uploadReady(desk.reporter, 'dated-ledger.csv', utf8(delimitedText({ header: ['supplier', 'amount', 'paid on', 'logged at'], rows: ROWS })))
})

describe('a date column\'s cells that name no date', () => {
  it('are counted in the profile as our own reading counts them, and listed with their row numbers and text, page by page', async () => {
    const expected = unreadRows(2, 'dmy')
    // By construction: TBC, 30/02, 2026-02-29 and =NOW() rows.
    expect(expected.length).toBe(7 + 10 + 5 + 1)
    const column = ledger.columns.find(c => c.name === 'paid on')!
    expect(column).toMatchObject({ kind: 'date', numeric: false })
    expect(column.dates).toMatchObject({ order: 'dmy', settled: true, unread: expected.length })
    expect(await everyCell(ledger.id, 'column=paid%20on&status=unreadable')).toEqual({ total: expected.length, items: expected })
    // The blank ones are their own list.
    expect((await cells(ledger.id, 'column=paid%20on&status=blank')).items).toEqual(ROWS.flatMap((row, n) => (row[2] === '' ? [{ rowNo: n + 1, text: '' }] : [])))
  })

  it('are listed in a column of timestamps with the whole text the file wrote, time of day and all', async () => {
    const expected = unreadRows(3, 'dmy')
    const column = ledger.columns.find(c => c.name === 'logged at')!
    expect(column.dates).toMatchObject({ order: 'ymd', unread: expected.length, timed: ROWS.length - ROWS.filter((_, n) => (n + 1) % 61 === 0).length })
    const listed = await everyCell(ledger.id, 'column=logged%20at&status=unreadable')
    expect(listed).toEqual({ total: expected.length, items: expected })
    expect(listed.items[0]).toEqual({ rowNo: 53, text: '2026-02-30 05:15' })
  })

  it('download as CSV, every one by row, with a formula written inert', async () => {
    const response = await fetch(`${desk.reporter.base}/api/datasets/${ledger.id}/cells?column=paid%20on&status=unreadable&format=csv`, { headers: { cookie: desk.reporter.cookie } })
    expect(response.status).toBe(200)
    // RFC 4180 rows; OWASP's CSV-injection advice: a cell starting with "=" gets an apostrophe.
    const lines = unreadRows(2, 'dmy').map(({ rowNo, text }) => `${rowNo},${text.startsWith('=') ? `'${text}` : text}`)
    expect(await response.text()).toBe(['row,paid on', ...lines].join('\r\n') + '\r\n')
  })

  it('change when the column is read again month first, as our own reading in that order says', async () => {
    const reply = await desk.reporter.post(`/api/datasets/${ledger.id}/readings`, { columns: { 'paid on': { dateOrder: 'mdy' } } })
    expectStatus(reply, 201)
    const version = await waitUntilSettled(desk.reporter, reply.body.id) as DatasetDTO
    const expected = unreadRows(2, 'mdy')
    // Month first, every day past the 12th is a month past December.
    expect(expected.length).toBeGreaterThan(200)
    expect(version.columns.find(c => c.name === 'paid on')!.dates).toMatchObject({ order: 'mdy', settled: true, unread: expected.length })
    expect(await everyCell(version.id, 'column=paid%20on&status=unreadable')).toEqual({ total: expected.length, items: expected })
    // The first reading's list is as it was.
    expect((await cells(ledger.id, 'column=paid%20on&status=unreadable')).total).toBe(unreadRows(2, 'dmy').length)
  })

  it('are not asked of a text column, which has only blanks to list', async () => {
    const refused = await desk.reporter.get(`/api/datasets/${ledger.id}/cells?column=supplier&status=unreadable`)
    expect(refused.status).toBe(400)
    expect(refused.body.data).toEqual([expect.objectContaining({ path: 'status' })])
  })
})

describe('a JSON record\'s keys that are not among the columns', () => {
  // The columns are the keys of the first 1,000 records (docs/product-rules.md); records 1,003, 1,010
  // and 1,200 bring keys of their own, which the file holds and must not lose.
  const records: Record<string, unknown>[] = Array.from({ length: 1200 }, (_, n) => ({ vendor: `Vendor ${n % 23}`, amount: Number(((n + 1) * 12.5).toFixed(2)) }))
  records[1002] = { ...records[1002], note: 'paid twice' }
  records[1009] = { vendor: 'Late Vendor', approver: 'K. Osei', amount: 99, batch: 'B-4' }
  records[1199] = { ...records[1199], flag: true }
  let id: string

  beforeAll(async () => {
    const reply = await upload(desk.reporter, 'late-keys.json', utf8(JSON.stringify(records)), { title: 'Late keys' }, `?newsroomId=${desk.id}`)
    expectStatus(reply, 201)
    id = (await waitUntilSettled(desk.reporter, reply.body.id)).id
  })

  it('are kept: the records are counted and listed by number with each such key and its value', async () => {
    const dataset = (await desk.reporter.get(`/api/datasets/${id}`)).body as DatasetDTO
    expect(dataset.columns.map(c => c.name)).toEqual(['vendor', 'amount'])
    // Worked out from the records themselves: those with a key past vendor and amount.
    const withOthers = records.flatMap((record, n) => {
      const others = Object.entries(record).filter(([key]) => key !== 'vendor' && key !== 'amount')
      return others.length ? [{ rowNo: n + 1, extra: others.map(([key, value]) => `${key}: ${String(value)}`) }] : []
    })
    expect(dataset.raggedRows).toBe(withOthers.length)
    const listed = (await desk.reporter.get(`/api/datasets/${id}/ragged-rows`)).body
    expect(listed.total).toBe(3)
    expect(listed.items.map(({ rowNo, extra }: { rowNo: number, extra: string[] }) => ({ rowNo, extra }))).toEqual(withOthers)
    expect(listed.items[1]).toMatchObject({ rowNo: 1010, extra: ['approver: K. Osei', 'batch: B-4'] })
  })

  it('are shown with the record on the dataset\'s rows page', async () => {
    const page = (await desk.reporter.get(`/api/datasets/${id}/preview?page=21`)).body
    const row = page.items.find((r: { rowNo: number }) => r.rowNo === 1010)
    expect(row).toMatchObject({ rowNo: 1010, cells: ['Late Vendor', '99'], extra: ['approver: K. Osei', 'batch: B-4'] })
  })
})
