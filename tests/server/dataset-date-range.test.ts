import { beforeAll, describe, expect, it } from 'vitest'
import { uploadCsv } from '../support/datasets'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { datedPaymentsCsv } from '../support/stories'

// The range a chart's subtitle states comes from the import's reading of the dataset's date column
// (`columns[].dates`). Expected days are those the fixture file holds (tests/support/stories.ts).
let desk: TestNewsroom
beforeAll(async () => {
  desk = await createTestNewsroom('Date range desk')
})

const columnsOf = async (id: string) => (await desk.reporter.get(`/api/datasets/${id}`)).body.columns as Array<{ name: string, kind: string, coded: boolean, dates: { first: string, last: string, read: number, unread: number, order: string, settled: boolean } | null }>

describe('the dates of a date column, read at import', () => {
  it('reads a short ledger paid on a different day nearly every time, with its earliest and latest day', async () => {
    const columns = await columnsOf(await uploadCsv(desk.reporter, desk.id, datedPaymentsCsv(), 'Dated payments'))
    const paidOn = columns.find(c => c.name === 'paid_on')!
    expect(paidOn.kind).toBe('date')
    // 120 rows, each paid on a day of its own: the column is read although none of its days repeats.
    expect(paidOn.dates).toEqual({ order: 'dmy', settled: true, read: 120, unread: 0, first: '2024-02-03', last: '2025-11-28' })
  })

  it('still leaves a column of references that never repeat uncoded, and states no dates for a file without a date column', async () => {
    const csv = ['reference,supplier,amount', ...Array.from({ length: 150 }, (_, i) => `REF-${10_000 + i * 37},${['Northgate Paving', 'Quay Lighting'][i % 2]},${(12.5 + i * 13.7).toFixed(2)}`)].join('\n')
    const columns = await columnsOf(await uploadCsv(desk.reporter, desk.id, csv, 'Undated payments'))
    expect(columns.find(c => c.name === 'reference')!.coded).toBe(false)
    expect(columns.find(c => c.name === 'supplier')!.coded).toBe(true)
    expect(columns.map(c => c.dates)).toEqual([null, null, null])
    expect(columns.some(c => c.kind === 'date')).toBe(false)
  })
})
