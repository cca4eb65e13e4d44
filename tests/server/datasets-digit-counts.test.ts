import { beforeAll, describe, expect, it } from 'vitest'
import { DOT_STYLE, MINIMUM_VALUES, TEST_NAMES, isGroupable, runDigitTest } from '#shared/digits'
import type { TestName, TestResult } from '#shared/digits'
import { DEPARTMENTS, VENDORS, leadingDigits, ledger, ledgerTable } from '../fixtures/datasets/ledger'
import type { LedgerEntry } from '../fixtures/datasets/ledger'
import { delimitedText, utf8 } from '../support/dataset-files'
import { uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

// The server counts stored digit records with SQL GROUP BY; the engine, given the same cells,
// counts them in memory. Both must give the same bins and statistics for every test.
const ENTRIES = ledger()
const THRESHOLD = 10_000

interface Variant {
  label: string
  filters?: object[]
  keep: (e: LedgerEntry) => boolean
  groupBy?: boolean
}

// The filters' meaning, written out here from the fixture rather than from the query builder.
const VARIANTS: Variant[] = [
  { label: 'all rows', keep: () => true },
  { label: 'department equals Parks', filters: [{ column: 'department', op: 'equals', value: 'Parks' }], keep: e => e.department === 'Parks' },
  { label: 'quantity between 50 and 300', filters: [{ column: 'quantity', op: 'between', min: 50, max: 300 }], keep: e => e.units !== null && e.units >= 50 && e.units <= 300 },
  { label: 'grouped by vendor', keep: () => true, groupBy: true },
  { label: 'department equals Roads, grouped by vendor', filters: [{ column: 'department', op: 'equals', value: 'Roads' }], keep: e => e.department === 'Roads', groupBy: true },
]

function engineResult(test: TestName, entries: LedgerEntry[], grouped: boolean): TestResult {
  const values = (list: LedgerEntry[]) => list.map(e => e.amount)
  const result = runDigitTest({
    test,
    column: 'amount',
    input: { values: values(entries), style: DOT_STYLE },
    threshold: test === 'threshold' ? { limit: THRESHOLD } : undefined,
    // The server ranks groups down to each test's absolute minimum (server/services/datasets/digit-tests.ts).
    groups: grouped
      ? { minSize: MINIMUM_VALUES[test]?.stop, items: VENDORS.map(vendor => ({ key: vendor, input: { values: values(entries.filter(e => e.vendor === vendor)), style: DOT_STYLE } })) }
      : undefined,
  })
  // What the same object looks like after travelling as JSON, as the server's reply did.
  return JSON.parse(JSON.stringify(result))
}

/**
 * Equal structures; counts and texts exactly, fractions to 1e-12 relative. The engine adds up
 * some expectations in the order the counts arrive, and SQL's GROUP BY order is not the values'
 * order, so the last bits of a sum may differ while every count is the same.
 */
function expectSame(actual: unknown, expected: unknown, path: string) {
  if (typeof expected === 'number' && typeof actual === 'number' && !(Number.isInteger(expected) && Number.isInteger(actual))) {
    expect(Math.abs(actual - expected), `${path}: ${actual} vs ${expected}`).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(expected)))
    return
  }
  if (expected && typeof expected === 'object' && actual && typeof actual === 'object') {
    expect(Object.keys(actual).sort(), path).toEqual(Object.keys(expected).sort())
    for (const key of Object.keys(expected)) expectSame((actual as any)[key], (expected as any)[key], `${path}.${key}`)
    return
  }
  expect(actual, path).toEqual(expected)
}

let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => {
  newsroom = await createTestNewsroom('Digit counts desk')
  const dataset = await uploadReady(newsroom.reporter, 'ledger.csv', utf8(delimitedText(ledgerTable(ENTRIES))))
  expect(dataset.rowCount).toBe(ENTRIES.length)
  datasetId = dataset.id
})

async function serverResult(test: TestName, variant: Variant): Promise<TestResult> {
  const body = {
    column: 'amount', test, filters: variant.filters,
    groupBy: variant.groupBy ? 'vendor' : undefined, threshold: test === 'threshold' ? THRESHOLD : undefined,
  }
  const reply = await newsroom.reporter.post(`/api/datasets/${datasetId}/digit-tests`, body)
  expect(reply.status, JSON.stringify(reply.body)).toBe(200)
  return reply.body
}

describe('digit counts from SQL equal the engine\'s counts from the same cells', () => {
  it('the fixture is varied enough to exercise every test', () => {
    const kinds = new Set(ENTRIES.map(e => e.meaning.kind))
    expect([...kinds].sort()).toEqual(['blank', 'number', 'unreadable', 'zero'])
    expect(ENTRIES.some(e => e.amount.startsWith('('))).toBe(true)
    expect(ENTRIES.some(e => e.amount.includes(','))).toBe(true)
    expect(new Set(ENTRIES.map(e => e.department))).toEqual(new Set(DEPARTMENTS))
  })

  for (const variant of VARIANTS) {
    for (const test of TEST_NAMES) {
      if (variant.groupBy && !isGroupable(test)) continue
      it(`${test}, ${variant.label}`, async () => {
        const server = await serverResult(test, variant)
        const engine = engineResult(test, ENTRIES.filter(variant.keep), Boolean(variant.groupBy))
        expect(server.n).toBe(engine.n)
        expect(server.n).toBeGreaterThan(0)
        for (const field of ['excluded', 'bins', 'chiSquare', 'mad', 'ks', 'duplicates', 'threshold', 'suitability', 'groups', 'groupsSkipped'] as const) {
          expectSame(server[field], engine[field], field)
        }
        // The mantissa arc sums cos/sin of mantissas the database keeps as real (float4): close, not equal.
        if (engine.arc) {
          expect(server.arc!.l2).toBeCloseTo(engine.arc.l2, 5)
          expect(server.arc!.p).toBeCloseTo(engine.arc.p, 3)
        }
        else expect(server.arc).toBeNull()
        if (variant.groupBy) expect(server.groups!.length + server.groupsSkipped!).toBe(VENDORS.length)
      })
    }
  }

  it('first-digit counts also equal a count made from the fixture\'s own cents', async () => {
    const server = await serverResult('first-digit', VARIANTS[0]!)
    const mine = new Map<string, number>()
    for (const e of ENTRIES) {
      if (e.meaning.kind !== 'number' || e.meaning.sign < 0) continue
      const digit = leadingDigits(e.meaning.cents, 1)!
      mine.set(digit, (mine.get(digit) ?? 0) + 1)
    }
    expect(Object.fromEntries(server.bins.map(b => [b.key, b.count]))).toEqual(Object.fromEntries([...mine].sort()))
    const kinds = (kind: string) => ENTRIES.filter(e => e.meaning.kind === kind).length
    const negatives = ENTRIES.filter(e => e.meaning.kind === 'number' && e.meaning.sign < 0).length
    expect(server.excluded).toMatchObject({ blank: kinds('blank'), unreadable: kinds('unreadable'), zero: kinds('zero'), negative: negatives })
  })
})

describe('digit test requests that cannot run', () => {
  const cases: Array<[string, object, string]> = [
    ['an unknown column', { column: 'amount_typo', test: 'first-digit' }, 'column'],
    ['a text column', { column: 'vendor', test: 'first-digit' }, 'column'],
    ['a range filter on a text column', { column: 'amount', test: 'first-digit', filters: [{ column: 'vendor', op: 'between', min: 1 }] }, 'filters.0.column'],
    ['grouping a test that ranks no groups', { column: 'amount', test: 'duplicates', groupBy: 'vendor' }, 'groupBy'],
    ['the threshold test without its limit', { column: 'amount', test: 'threshold' }, 'threshold'],
  ]
  for (const [label, body, path] of cases) {
    it(`answers 400 for ${label}, naming the field`, async () => {
      const reply = await newsroom.reporter.post(`/api/datasets/${datasetId}/digit-tests`, body)
      expect(reply.status).toBe(400)
      expect(reply.body.data.map((e: any) => e.path)).toContain(path)
    })
  }
})
