import { beforeAll, describe, expect, it } from 'vitest'
import { TEST_NAMES } from '#shared/digits'
import { leadingDigits, ledger, ledgerTable } from '../fixtures/datasets/ledger'
import type { LedgerEntry } from '../fixtures/datasets/ledger'
import { delimitedText, utf8 } from '../support/dataset-files'
import { allPages, uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

const ENTRIES = ledger()
const TABLE = ledgerTable(ENTRIES)
const PAGE_SIZE = 50

let newsroom: TestNewsroom
let base: string
beforeAll(async () => {
  newsroom = await createTestNewsroom('Drill-down desk')
  const dataset = await uploadReady(newsroom.reporter, 'ledger.csv', utf8(delimitedText(TABLE)))
  base = `/api/datasets/${dataset.id}/rows`
})

/** Row numbers (1-based, file order) of the entries whose amount falls in a bin, counted from the fixture's cents. */
function rowsOfBin(key: string, sign: 1 | -1, keep: (e: LedgerEntry) => boolean = () => true): number[] {
  return ENTRIES.flatMap((e, i) => {
    const m = e.meaning
    return m.kind === 'number' && m.sign === sign && keep(e) && leadingDigits(m.cents, key.length) === key ? [i + 1] : []
  })
}

async function expectBin(query: string, expectedRows: number[]) {
  expect(expectedRows.length, 'the fixture puts rows in this bin').toBeGreaterThan(0)
  const { total, pages, items } = await allPages(newsroom.reporter, `${base}?${query}`)
  expect(total).toBe(expectedRows.length)
  expect(pages).toHaveLength(Math.max(1, Math.ceil(expectedRows.length / PAGE_SIZE)))
  pages.forEach((page, i) => {
    expect(page.page).toBe(i + 1)
    expect(page.items.length).toBe(Math.min(PAGE_SIZE, expectedRows.length - i * PAGE_SIZE))
  })
  expect(items.map(r => r.rowNo)).toEqual(expectedRows)
  // Each row comes back with the cells the file holds on that line.
  for (const row of items) expect(row.cells).toEqual(TABLE.rows[row.rowNo - 1])
}

describe('drill-down returns exactly the rows of a bin', () => {
  it('first digit 1 of the positive amounts, over several pages', async () => {
    const expected = rowsOfBin('1', 1)
    expect(expected.length).toBeGreaterThan(3 * PAGE_SIZE)
    await expectBin('column=amount&key=1&test=first-digit', expected)
  })

  it('first two digits 98 (the bunch under 10,000 lands here)', async () => {
    await expectBin('column=amount&key=98&test=first-two-digits', rowsOfBin('98', 1))
  })

  it('first three digits 123, with the test read from the key\'s length', async () => {
    await expectBin('column=amount&key=123', rowsOfBin('123', 1))
  })

  it('negative amounts on their own', async () => {
    const expected = rowsOfBin('1', -1)
    expect(expected.length).toBeGreaterThan(0)
    await expectBin('column=amount&key=1&test=first-digit&sign=negative', expected)
  })

  it('one group of a grouping column, under a filter', async () => {
    const filters = encodeURIComponent(JSON.stringify([{ column: 'department', op: 'equals', value: 'Roads' }]))
    const expected = rowsOfBin('2', 1, e => e.vendor === 'Alderbank Works' && e.department === 'Roads')
    expect(expected.length).toBeGreaterThan(PAGE_SIZE)
    await expectBin(`column=amount&key=2&test=first-digit&groupBy=vendor&group=${encodeURIComponent('Alderbank Works')}&filters=${filters}`, expected)
  })

  for (const test of TEST_NAMES) {
    it(`${test}: a bin's drill-down total equals the count the digit test gives it`, async () => {
      const threshold = test === 'threshold' ? '&threshold=10000' : ''
      const result = await newsroom.reporter.post(base.replace('/rows', '/digit-tests'), { column: 'amount', test, threshold: threshold ? 10_000 : undefined })
      expect(result.status).toBe(200)
      // The five fullest and the five emptiest non-empty bins.
      const filled = result.body.bins.filter((b: any) => b.count > 0).sort((a: any, b: any) => b.count - a.count)
      expect(filled.length).toBeGreaterThan(0)
      for (const bin of [...filled.slice(0, 5), ...filled.slice(-5)]) {
        const rows = await newsroom.reporter.get(`${base}?column=amount&test=${test}&key=${encodeURIComponent(bin.key)}${threshold}`)
        expect(rows.body.total, `${test} bin ${bin.key}`).toBe(bin.count)
      }
    })
  }

  it('answers an empty page past the last one, and 400 for a key that is not a bin', async () => {
    const expected = rowsOfBin('7', 1)
    const past = await newsroom.reporter.get(`${base}?column=amount&key=7&test=first-digit&page=${Math.ceil(expected.length / PAGE_SIZE) + 1}`)
    expect(past.status).toBe(200)
    expect(past.body).toMatchObject({ total: expected.length, items: [] })
    const notABin = await newsroom.reporter.get(`${base}?column=amount&key=0&test=first-digit`)
    expect(notABin.status).toBe(400)
  })
})
