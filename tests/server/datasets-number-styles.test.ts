import { readFileSync } from 'node:fs'
import { beforeAll, describe, expect, it } from 'vitest'
import { sha256Of, uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let newsroom: TestNewsroom
beforeAll(async () => {
  newsroom = await createTestNewsroom('Number styles desk')
})

// Three columns write the same five amounts three ways (docs/product-rules.md "The analysis": 1,234.50 and
// 1.234,50 and 1 234,50; parentheses and a trailing minus for negatives), separated by semicolons.
const BYTES = readFileSync(new URL('../fixtures/datasets/decimal-comma.csv', import.meta.url))

/*
 * By hand, every column holds 1234.5, 12000, 987.1, −3.75, 250000 (rows 1–5):
 *   parsed 5, negative 1, zero 0, min −3.75, max 250000,
 *   span log10(250000) − log10(3.75) = 5.3979400 − 0.5740313 = 4.8239087.
 * First digits of the positives: 1 (1234.5), 1 (12000), 9 (987.1), 2 (250000).
 */
const COLUMNS = ['awarded', 'paid', 'retained']

describe('decimal commas and thousands separators', () => {
  let dataset: any
  beforeAll(async () => {
    dataset = await uploadReady(newsroom.reporter, 'grants.csv', BYTES)
  })

  it('detects the semicolon and keeps the bytes\' SHA-256', () => {
    expect(dataset.delimiter).toBe(';')
    expect(dataset.rowCount).toBe(5)
    // Source: node:crypto over the fixture's bytes.
    expect(dataset.sha256).toBe(sha256Of(BYTES))
    expect(dataset.byteSize).toBe(BYTES.length)
  })

  for (const name of COLUMNS) {
    it(`reads ${name} to the same numbers`, async () => {
      const column = dataset.columns.find((c: any) => c.name === name)
      expect(column).toMatchObject({ kind: 'amount', parsed: 5, blank: 0, unreadable: 0, zero: 0, negative: 1, min: '-3.75', max: '250000' })
      expect(column.magnitudeSpan).toBeCloseTo(4.8239087, 5)

      const test = await newsroom.reporter.post(`/api/datasets/${dataset.id}/digit-tests`, { column: name, test: 'first-digit' })
      expect(test.status, JSON.stringify(test.body)).toBe(200)
      const counts = Object.fromEntries(test.body.bins.map((b: any) => [b.key, b.count]))
      expect(counts).toEqual({ 1: 2, 2: 1, 3: 0, 4: 0, 5: 0, 6: 0, 7: 0, 8: 0, 9: 1 })
      expect(test.body.excluded).toMatchObject({ negative: 1, blank: 0, unreadable: 0, zero: 0 })
    })

    it(`sorts the preview by ${name} as numbers, not as text`, async () => {
      const reply = await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview?sort=${name}&dir=asc`)
      // By hand: −3.75 (row 4) < 987.1 (row 3) < 1234.5 (row 1) < 12000 (row 2) < 250000 (row 5).
      expect(reply.body.items.map((r: any) => r.rowNo)).toEqual([4, 3, 1, 2, 5])
    })
  }
})
