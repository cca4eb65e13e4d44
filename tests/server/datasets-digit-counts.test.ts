import { beforeAll, describe, expect, it } from 'vitest'
import { DISTRIBUTIONS, DOT_STYLE, MINIMUM_VALUES, TEST_NAMES, isGroupable, runDigitTest } from '#shared/digits'
import type { TestName, TestResult } from '#shared/digits'
import { DEPARTMENTS, leadingDigits, ledger, ledgerTable } from '../fixtures/datasets/ledger'
import type { LedgerEntry } from '../fixtures/datasets/ledger'
import { delimitedText, utf8 } from '../support/dataset-files'
import { uploadReady } from '../support/datasets'
import { sql } from '../support/database'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

// The server counts stored digit records with SQL GROUP BY; the engine, given the same cells,
// counts them in memory. Both must give the same bins and statistics for every test.
const ENTRIES = ledger()
const THRESHOLD = 10_000

interface Variant {
  label: string
  filters?: object[]
  keep: (e: LedgerEntry) => boolean
  /** The grouping the request names, and each entry's group as the fixture itself says. */
  groupBy?: { column: string, period?: 'year' | 'quarter' | 'month', of: (e: LedgerEntry) => string }
  /** The sign of the values tested (positive unless named). */
  sign?: 'positive' | 'negative'
  /** No cell of the import holds it: the distribution tests count the column's records in memory (column-scan.ts). */
  inMemory?: true
}

const byVendor = { column: 'vendor', of: (e: LedgerEntry) => e.vendor }
/** The fixture's own day (YYYY-MM-DD) cut to a period; '' for a cell that names no date. */
const periodOf = (period: 'year' | 'quarter' | 'month') => (e: LedgerEntry) => {
  if (!e.paidDay) return ''
  if (period === 'year') return e.paidDay.slice(0, 4)
  if (period === 'month') return e.paidDay.slice(0, 7)
  return `${e.paidDay.slice(0, 4)}-Q${Math.ceil(Number(e.paidDay.slice(5, 7)) / 3)}`
}
/** The amount's signed value in cents (0 for a zero cell), or null for blank and unreadable cells. */
const signedCents = (e: LedgerEntry) => (e.meaning.kind === 'number' ? e.meaning.sign * e.meaning.cents : e.meaning.kind === 'zero' ? 0 : null)
/** An amount range as the filter means it: both ends inclusive, either open; cents compared exactly. */
const amountBetween = (min?: number, max?: number) => (e: LedgerEntry) => {
  const cents = signedCents(e)
  return cents !== null && (min === undefined || cents >= min * 100) && (max === undefined || cents <= max * 100)
}
/** Amounts that occur in the fixture, by rank among its positive values: range ends that fall exactly on values. */
const POSITIVE_CENTS = ENTRIES.flatMap(e => (e.meaning.kind === 'number' && e.meaning.sign > 0 ? [e.meaning.cents] : [])).sort((a, b) => a - b)
const [AT_LOW, AT_HIGH] = [POSITIVE_CENTS[400]! / 100, POSITIVE_CENTS[2100]! / 100]
const byDepartment = { column: 'department', of: (e: LedgerEntry) => e.department }
const paidBetween = (from: string, to: string) => (e: LedgerEntry) => e.paidDay !== null && e.paidDay >= from && e.paidDay <= to

// The filters' meaning, written out here from the fixture rather than from the query builder.
const VARIANTS: Variant[] = [
  { label: 'all rows', keep: () => true },
  { label: 'department equals Parks', filters: [{ column: 'department', op: 'equals', value: 'Parks' }], keep: e => e.department === 'Parks' },
  { label: 'quantity between 50 and 300', filters: [{ column: 'quantity', op: 'between', min: 50, max: 300 }], keep: e => e.units !== null && e.units >= 50 && e.units <= 300 },
  { label: 'amount at least 100', filters: [{ column: 'amount', op: 'between', min: 100 }], keep: e => e.meaning.kind === 'number' && e.meaning.sign > 0 && e.meaning.cents >= 10_000 },
  { label: 'vendor one of one (its repeated amounts kept at import)', filters: [{ column: 'vendor', op: 'one-of', values: ['Brindle & Pike'] }], keep: e => e.vendor === 'Brindle & Pike' },
  { label: 'vendor one of two', filters: [{ column: 'vendor', op: 'one-of', values: ['Corvid Haulage', ' Dunmore Signs'] }], keep: e => ['Corvid Haulage', 'Dunmore Signs'].includes(e.vendor) },
  { label: 'department not one of Parks', filters: [{ column: 'department', op: 'not-one-of', values: ['Parks'] }], keep: e => e.department !== 'Parks' },
  { label: 'paid in 2025', filters: [{ column: 'paid_on', op: 'dates', from: '2025-01-01', to: '2025-12-31' }], keep: paidBetween('2025-01-01', '2025-12-31') },
  {
    label: 'three filters at once',
    filters: [
      { column: 'department', op: 'one-of', values: ['Roads', 'Parks'] },
      { column: 'quantity', op: 'between', min: 20 },
      { column: 'paid_on', op: 'dates', from: '2024-07-01' },
    ],
    keep: e => ['Roads', 'Parks'].includes(e.department) && e.units !== null && e.units >= 20 && e.paidDay !== null && e.paidDay >= '2024-07-01',
  },
  { label: 'grouped by vendor', keep: () => true, groupBy: byVendor },
  { label: 'department equals Roads, grouped by vendor', filters: [{ column: 'department', op: 'equals', value: 'Roads' }], keep: e => e.department === 'Roads', groupBy: byVendor },
  {
    label: 'vendor one of two and department not Parks',
    filters: [{ column: 'vendor', op: 'one-of', values: ['Alderbank Works', 'Fallowmere Ltd'] }, { column: 'department', op: 'not-one-of', values: ['Parks'] }],
    keep: e => ['Alderbank Works', 'Fallowmere Ltd'].includes(e.vendor) && e.department !== 'Parks',
  },
  { label: 'department one of two, grouped by vendor', filters: [{ column: 'department', op: 'one-of', values: ['Roads', 'Libraries'] }], keep: e => e.department !== 'Parks', groupBy: byVendor },
  { label: 'vendor none of one, grouped by vendor', filters: [{ column: 'vendor', op: 'not-one-of', values: ['Alderbank Works'] }], keep: e => e.vendor !== 'Alderbank Works', groupBy: byVendor },
  { label: 'grouped by month of paid_on', keep: () => true, groupBy: { column: 'paid_on', period: 'month', of: periodOf('month') } },
  { label: 'grouped by quarter of paid_on, vendor Alderbank Works', filters: [{ column: 'vendor', op: 'one-of', values: ['Alderbank Works'] }], keep: e => e.vendor === 'Alderbank Works', groupBy: { column: 'paid_on', period: 'quarter', of: periodOf('quarter') } },
  // Ranges of the tested column: the value ladder adds up the rungs a range holds whole and counts the
  // records of those it cuts through (server/services/datasets/value-ladder.ts); ends exact, inclusive.
  { label: 'amount between 100 and 50,000', filters: [{ column: 'amount', op: 'between', min: 100, max: 50000 }], keep: amountBetween(100, 50000) },
  { label: 'amount at least 99.995 (between two cents)', filters: [{ column: 'amount', op: 'between', min: 99.995 }], keep: amountBetween(99.995) },
  { label: 'amount from one stored value to another, both kept', filters: [{ column: 'amount', op: 'between', min: AT_LOW, max: AT_HIGH }], keep: amountBetween(AT_LOW, AT_HIGH) },
  { label: 'amount at most 25,000 (zeros and negatives inside)', filters: [{ column: 'amount', op: 'between', max: 25000 }], keep: amountBetween(undefined, 25000) },
  { label: 'amount from -2,000 to 12,000 (across zero)', filters: [{ column: 'amount', op: 'between', min: -2000, max: 12000 }], keep: amountBetween(-2000, 12000) },
  { label: 'amount from -50,000 to -20, negative values tested', sign: 'negative', filters: [{ column: 'amount', op: 'between', min: -50000, max: -20 }], keep: amountBetween(-50000, -20) },
  { label: 'amount at most -1,000, negative values tested, grouped by department', sign: 'negative', filters: [{ column: 'amount', op: 'between', max: -1000 }], keep: amountBetween(undefined, -1000), groupBy: byDepartment },
  { label: 'two ranges of amount at once (100 up, and up to 80,000)', filters: [{ column: 'amount', op: 'between', min: 100 }, { column: 'amount', op: 'between', max: 80000 }], keep: amountBetween(100, 80000) },
  { label: 'amount at least 150, grouped by vendor', filters: [{ column: 'amount', op: 'between', min: 150 }], keep: amountBetween(150), groupBy: byVendor },
  { label: 'amount from 150 to 20,000, grouped by vendor', filters: [{ column: 'amount', op: 'between', min: 150, max: 20000 }], keep: amountBetween(150, 20000), groupBy: byVendor },
  { label: 'amount at least 100 and department Parks', filters: [{ column: 'amount', op: 'between', min: 100 }, { column: 'department', op: 'equals', value: 'Parks' }], keep: e => amountBetween(100)(e) && e.department === 'Parks' },
  { label: 'amount up to 30,000, department not Parks, grouped by department', filters: [{ column: 'amount', op: 'between', max: 30000 }, { column: 'department', op: 'not-one-of', values: ['Parks'] }], keep: e => amountBetween(undefined, 30000)(e) && e.department !== 'Parks', groupBy: byDepartment },
  { label: 'amount at least 1,000, grouped by month of paid_on', filters: [{ column: 'amount', op: 'between', min: 1000 }], keep: amountBetween(1000), groupBy: { column: 'paid_on', period: 'month', of: periodOf('month') } },
  { label: 'paid from March 2024 to June 2025, grouped by year of paid_on', filters: [{ column: 'paid_on', op: 'dates', from: '2024-03-01', to: '2025-06-30' }], keep: paidBetween('2024-03-01', '2025-06-30'), groupBy: { column: 'paid_on', period: 'year', of: periodOf('year') } },
  // Two or three text and date columns beside a range of the tested column: no cell of the import holds
  // these, and the test server's "verify" mode also checks each answer from memory against SQL's count.
  {
    label: 'amount at least 100, department one of two, grouped by vendor',
    filters: [{ column: 'amount', op: 'between', min: 100 }, { column: 'department', op: 'one-of', values: ['Roads', 'Parks'] }],
    keep: e => amountBetween(100)(e) && ['Roads', 'Parks'].includes(e.department), groupBy: byVendor, inMemory: true,
  },
  {
    label: 'vendor not one of two, department not Parks, paid from July 2024, grouped by month of paid_on',
    filters: [{ column: 'vendor', op: 'not-one-of', values: ['Alderbank Works', 'Corvid Haulage'] }, { column: 'department', op: 'not-one-of', values: ['Parks'] }, { column: 'paid_on', op: 'dates', from: '2024-07-01' }],
    keep: e => !['Alderbank Works', 'Corvid Haulage'].includes(e.vendor) && e.department !== 'Parks' && e.paidDay !== null && e.paidDay >= '2024-07-01',
    groupBy: { column: 'paid_on', period: 'month', of: periodOf('month') }, inMemory: true,
  },
  {
    label: 'amount from -2,000 to 12,000, department Roads, paid in 2025, negative values tested, grouped by vendor',
    sign: 'negative',
    filters: [{ column: 'amount', op: 'between', min: -2000, max: 12000 }, { column: 'department', op: 'equals', value: 'Roads' }, { column: 'paid_on', op: 'dates', from: '2025-01-01', to: '2025-12-31' }],
    keep: e => amountBetween(-2000, 12000)(e) && e.department === 'Roads' && paidBetween('2025-01-01', '2025-12-31')(e), groupBy: byVendor, inMemory: true,
  },
]

function engineResult(test: TestName, entries: LedgerEntry[], groupBy: Variant['groupBy'], sign: Variant['sign']): TestResult {
  const values = (list: LedgerEntry[]) => list.map(e => e.amount)
  const keys = groupBy ? [...new Set(entries.map(groupBy.of))] : []
  const result = runDigitTest({
    test,
    column: 'amount',
    sign,
    input: { values: values(entries), style: DOT_STYLE },
    threshold: test === 'threshold' ? { limit: THRESHOLD } : undefined,
    // The server ranks groups down to each test's absolute minimum (server/services/datasets/digit-tests.ts).
    groups: groupBy
      ? { minSize: MINIMUM_VALUES[test]?.stop, items: keys.map(key => ({ key, input: { values: values(entries.filter(e => groupBy.of(e) === key)), style: DOT_STYLE } })) }
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
  return (await serverReply(test, variant)).body
}

async function serverReply(test: TestName, variant: Variant) {
  const body = {
    column: 'amount', test, filters: variant.filters, sign: variant.sign,
    groupBy: variant.groupBy?.column, period: variant.groupBy?.period, threshold: test === 'threshold' ? THRESHOLD : undefined,
  }
  const reply = await newsroom.reporter.post(`/api/datasets/${datasetId}/digit-tests`, body)
  expect(reply.status, JSON.stringify(reply.body)).toBe(200)
  return reply as typeof reply & { body: TestResult }
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
        const reply = await serverReply(test, variant)
        const server = reply.body
        if (variant.inMemory && test in DISTRIBUTIONS) expect(reply.headers.get('x-mantissa-counted-from')).toBe('records in memory')
        const kept = ENTRIES.filter(variant.keep)
        const engine = engineResult(test, kept, variant.groupBy, variant.sign)
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
        if (variant.groupBy) expect(server.groups!.length + server.groupsSkipped!).toBe(new Set(kept.map(variant.groupBy.of)).size)
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

describe('the value ladder an import counts', () => {
  it('cuts the amounts into rungs whose cells hold every number and zero once', async () => {
    const { rows: [column] } = await sql('SELECT ladder FROM dataset_columns WHERE dataset_id = $1 AND name = $2', [datasetId, 'amount'])
    const bounds: string[] = column.ladder.bounds
    expect(bounds.length).toBeGreaterThan(30)
    // Ascending, as exact decimals (compared here in cents, from the fixture's own two decimals).
    const cents = bounds.map(b => Math.round(Number(b) * 100))
    expect(cents).toEqual([...cents].sort((a, b) => a - b))
    expect(new Set(cents).size).toBe(cents.length)
    // counts[1:5] are blank, unreadable, zero, positive, negative (digit-cube.ts); the fixture says how many of each.
    const kinds = (kind: string) => ENTRIES.filter(e => e.meaning.kind === kind).length
    const signed = (sign: number) => ENTRIES.filter(e => e.meaning.kind === 'number' && e.meaning.sign === sign).length
    const { rows: [sums] } = await sql(
      `SELECT sum(counts[1])::int AS blank, sum(counts[2])::int AS unreadable, sum(counts[3])::int AS zero, sum(counts[4])::int AS positive, sum(counts[5])::int AS negative
       FROM digit_cube c JOIN dataset_columns k ON k.dataset_id = c.dataset_id AND k.position = c.column_pos
       WHERE c.dataset_id = $1 AND k.name = 'amount' AND c.group_pos = -2 AND c.pair_pos = -1`,
      [datasetId],
    )
    expect(sums).toEqual({ blank: 0, unreadable: 0, zero: kinds('zero'), positive: signed(1), negative: signed(-1) })
  })
})

describe('digit test requests that cannot run', () => {
  const cases: Array<[string, object, string]> = [
    ['an unknown column', { column: 'amount_typo', test: 'first-digit' }, 'column'],
    ['a text column', { column: 'vendor', test: 'first-digit' }, 'column'],
    ['a range filter on a text column', { column: 'amount', test: 'first-digit', filters: [{ column: 'vendor', op: 'between', min: 1 }] }, 'filters.0.column'],
    ['grouping a test that ranks no groups', { column: 'amount', test: 'duplicates', groupBy: 'vendor' }, 'groupBy'],
    ['a date range on a text column', { column: 'amount', test: 'first-digit', filters: [{ column: 'vendor', op: 'dates', from: '2025-01-01' }] }, 'filters.0.column'],
    ['a text filter on a number column', { column: 'amount', test: 'first-digit', filters: [{ column: 'quantity', op: 'one-of', values: ['5'] }] }, 'filters.0.column'],
    ['a period of a column without dates', { column: 'amount', test: 'first-digit', groupBy: 'vendor', period: 'month' }, 'period'],
    ['a date that does not exist', { column: 'amount', test: 'first-digit', filters: [{ column: 'paid_on', op: 'dates', from: '2025-02-30' }] }, 'filters.0.from'],
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

describe('a date column read at import', () => {
  it('is read day first, as its own values settle, with the rows that gave no date counted', async () => {
    const reply = await newsroom.reporter.get(`/api/datasets/${datasetId}`)
    const paid = reply.body.columns.find((c: any) => c.name === 'paid_on')
    // Expected values from the fixture's own days (tests/fixtures/datasets/ledger.ts), not from the reader.
    const days = ENTRIES.map(e => e.paidDay).filter((d): d is string => d !== null).sort()
    expect(paid.kind).toBe('date')
    expect(paid.dates).toEqual({ order: 'dmy', settled: true, read: days.length, unread: ENTRIES.length - days.length, first: days[0], last: days.at(-1) })
  })
})
