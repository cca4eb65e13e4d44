import type { TestName, TestResult } from '../digits'

export type LegendMark = 'observed' | 'stem' | 'range' | 'expected' | 'outside'

export interface LegendItem {
  mark: LegendMark
  text: string
}

/** What each test compares with: the words for the title, the capsule and the bar across it. */
export function expectation(test: TestName): { what: string, range: string, against: string | null } {
  if (test === 'duplicates') return { what: '', range: '', against: null }
  if (test === 'last-two-digits') return { what: 'What an even spread of endings expects', range: 'an even spread', against: 'against an even spread' }
  if (test === 'threshold') return { what: 'A straight trend through the bands away from the limit', range: 'that trend', against: 'against a smooth trend' }
  return { what: 'What Benford’s law expects', range: 'the law', against: 'against Benford’s law' }
}

/**
 * The chart's legend in words, one entry per kind of mark the chart actually draws, in the order
 * a reader meets them. The same entries are drawn into exported images.
 */
export function legendItems(result: TestResult): LegendItem[] {
  const bins = result.bins
  const items: LegendItem[] = []
  const expected = expectation(result.test)
  if (result.test === 'duplicates') {
    items.push({ mark: 'stem', text: 'Rows holding exactly this amount' })
    return items
  }
  items.push({ mark: 'observed', text: result.test === 'summation' ? 'Share of the total amount in the data' : 'Share of values in the data' })
  if (bins.some(b => b.expectedShare !== null)) items.push({ mark: 'expected', text: expected.what })
  if (bins.some(b => b.low !== null && b.high !== null)) {
    items.push({ mark: 'range', text: `Range a sample of this size that follows ${expected.range} shows 95 times in 100` })
    if (bins.some(b => b.low !== null && b.high !== null && (b.count < b.low || b.count > b.high))) {
      items.push({ mark: 'outside', text: 'Outside that range (▲ above it, ▼ below it)' })
    }
  }
  return items
}
