import { beforeAll, describe, expect, it } from 'vitest'
import { DOT_STYLE, runDigitTest } from '#shared/digits'
import { seededRandom } from '../../server/services/demo/seeded-random'
import { delimitedText, utf8 } from '../support/dataset-files'
import { uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

// A column of timestamps (dates with a time of day, in the ISO 8601 / RFC 3339 forms people export:
// a space or T, Z or an offset; from memory) is read as the day each one writes, so it can be ranged
// and grouped by period like a date column. The expected counts come from the engine run on the values
// this file keeps, chosen by the days the generator itself wrote down.
const two = (n: number) => String(n).padStart(2, '0')
const random = seededRandom(3103)
const ENTRIES = Array.from({ length: 900 }, (_, i) => {
  const [m, d, h, min] = [1 + Math.floor(random() * 12), 1 + Math.floor(random() * 28), Math.floor(random() * 24), Math.floor(random() * 60)]
  const day = `2025-${two(m)}-${two(d)}`
  const forms = [`${day} ${two(h)}:${two(min)}`, `${day}T${two(h)}:${two(min)}:${two(i % 60)}Z`, `${day}T${two(h)}:${two(min)}:00-05:00`]
  return { day, paidAt: forms[i % 3]!, amount: (10 ** (1 + 4 * random())).toFixed(2) }
})

let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => {
  newsroom = await createTestNewsroom('Timestamps desk')
  const table = { header: ['paid_at', 'amount'], rows: ENTRIES.map(e => [e.paidAt, e.amount]) }
  const dataset = await uploadReady(newsroom.reporter, 'timestamps.csv', utf8(delimitedText(table)))
  datasetId = dataset.id
})

const engine = (values: string[], groups?: { key: string, values: string[] }[]) => JSON.parse(JSON.stringify(runDigitTest({
  test: 'first-digit', column: 'amount', input: { values, style: DOT_STYLE },
  groups: groups && { minSize: 1, items: groups.map(g => ({ key: g.key, input: { values: g.values, style: DOT_STYLE } })) },
})))

describe('a column of timestamps', () => {
  it('is a date column whose profile says every time of day was set aside', async () => {
    const reply = await newsroom.reporter.get(`/api/datasets/${datasetId}`)
    const column = reply.body.columns.find((c: any) => c.name === 'paid_at')
    const days = ENTRIES.map(e => e.day).sort()
    expect(column.kind).toBe('date')
    expect(column.dates).toEqual({ order: 'ymd', settled: true, read: ENTRIES.length, unread: 0, first: days[0], last: days.at(-1), timed: ENTRIES.length })
  })

  it('is ranged by day, both days included, with the counts the engine gives for the same rows', async () => {
    const reply = await newsroom.reporter.post(`/api/datasets/${datasetId}/digit-tests`, {
      column: 'amount', test: 'first-digit', filters: [{ column: 'paid_at', op: 'dates', from: '2025-03-01', to: '2025-06-30' }],
    })
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    const kept = ENTRIES.filter(e => e.day >= '2025-03-01' && e.day <= '2025-06-30').map(e => e.amount)
    const expected = engine(kept)
    expect(reply.body.n).toBe(kept.length)
    expect(reply.body.bins).toEqual(expected.bins)
    expect(reply.body.chiSquare).toEqual(expected.chiSquare)
  })

  it('is grouped by month, each month with the engine\'s counts for its rows', async () => {
    const reply = await newsroom.reporter.post(`/api/datasets/${datasetId}/digit-tests`, { column: 'amount', test: 'first-digit', groupBy: 'paid_at', period: 'month' })
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    const months = [...new Set(ENTRIES.map(e => e.day.slice(0, 7)))].sort()
    const expected = engine(ENTRIES.map(e => e.amount), months.map(key => ({ key, values: ENTRIES.filter(e => e.day.startsWith(key)).map(e => e.amount) })))
    const byKey = (groups: any[]) => Object.fromEntries(groups.map(g => [g.key, g.n]))
    expect(byKey(reply.body.groups)).toEqual(byKey(expected.groups))
    expect(Object.keys(byKey(reply.body.groups)).sort()).toEqual(months)
  })
})
