import { beforeAll, describe, expect, it } from 'vitest'
import { PAYMENT_FILES } from '../fixtures/datasets/payments'
import { uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let newsroom: TestNewsroom
beforeAll(async () => {
  newsroom = await createTestNewsroom('Profile desk')
})

/*
 * Worked out by hand from tests/fixtures/datasets/payments.ts.
 *
 * amount: 1250.50, 87.20, -45.00, 0, '', n/a, 3400, 0.75, 98000, 512.09, (300.00), 61.5
 *   blank 1 (row 5), unreadable 1 (row 6 "n/a"), parsed 12 − 1 − 1 = 10 (the zero counts as parsed),
 *   zero 1 (row 4), negative 2 (row 3 "-45.00", row 11 "(300.00)"),
 *   min −300 (row 11), max 98000 (row 9),
 *   span over non-zero |x|: log10(98000) − log10(0.75) = 4.9912261 + 0.1249387 = 5.1161648,
 *   kind amount (fractions and negatives).
 * items: 3, 1, 0, 2, 4, 1, 12, 1, 40, 5, 2, 7
 *   parsed 12, blank 0, unreadable 0, zero 1, negative 0, min 0, max 40,
 *   span log10(40) − log10(1) = 1.6020600, kind count (whole, none negative, not an id-like name).
 * invoice_no "PV0101"…: codes, not numbers: only blank (0) is counted, kind identifier.
 * vendor: names, kind text. paid_on: ISO days, kind date.
 */
const HAND_PROFILE = [
  { name: 'invoice_no', kind: 'identifier', numeric: false, parsed: null, blank: 0, unreadable: null, zero: null, negative: null, min: null, max: null, magnitudeSpan: null },
  { name: 'vendor', kind: 'text', numeric: false, parsed: null, blank: 0, unreadable: null, zero: null, negative: null, min: null, max: null, magnitudeSpan: null },
  { name: 'paid_on', kind: 'date', numeric: false, parsed: null, blank: 0, unreadable: null, zero: null, negative: null, min: null, max: null, magnitudeSpan: null },
  { name: 'amount', kind: 'amount', numeric: true, parsed: 10, blank: 1, unreadable: 1, zero: 1, negative: 2, min: '-300', max: '98000', magnitudeSpan: 5.1161648 },
  { name: 'items', kind: 'count', numeric: true, parsed: 12, blank: 0, unreadable: 0, zero: 1, negative: 0, min: '0', max: '40', magnitudeSpan: 1.60206 },
]

describe('column profile of a small fixture', () => {
  for (const [format, file] of Object.entries(PAYMENT_FILES)) {
    it(`matches the hand computation (${format})`, async () => {
      const dataset = await uploadReady(newsroom.reporter, file.name, await file.bytes())
      expect(dataset.columns).toHaveLength(HAND_PROFILE.length)
      HAND_PROFILE.forEach((expected, i) => {
        const { magnitudeSpan, ...counts } = expected
        const column = dataset.columns[i]
        expect(column, expected.name).toMatchObject({ ...counts, position: i })
        // The span is stored as a PostgreSQL real (about 7 significant digits).
        if (magnitudeSpan === null) expect(column.magnitudeSpan).toBeNull()
        else expect(column.magnitudeSpan, expected.name).toBeCloseTo(magnitudeSpan, 5)
      })
    })
  }

  it('keeps the first five distinct non-blank cells as samples, as written in the file', async () => {
    const dataset = await uploadReady(newsroom.reporter, PAYMENT_FILES.csv.name, await PAYMENT_FILES.csv.bytes())
    // By hand: amount's cells in file order, skipping the blank of row 5.
    expect(dataset.columns[3].samples).toEqual(['1250.50', '87.20', '-45.00', '0', 'n/a'])
    expect(dataset.columns[1].samples).toEqual(['Brackenfold Lighting', 'Quernstone Supplies', 'Gullwing Print Co', 'Tallowby Catering'])
  })
})
