import type { TestResult } from '../digits'
import { CONFORMITY_LABELS, TEST_LABELS } from './labels'
import { chartData } from './digit-chart'

const count = (n: number) => n.toLocaleString('en-GB')
const percent = (share: number) => `${(share * 100).toFixed(1)}%`

/**
 * One or two sentences saying what a chart shows, for readers and screen readers. They describe;
 * they never accuse: a digit test is a screen, not proof.
 */
export function summarize(result: TestResult): string {
  const column = result.column ? `“${result.column}”` : 'the column'
  if (result.n === 0) return `No values of ${column} could be tested.`
  const outside = chartData(result).filter(d => d.outside)
  const listed = outside.slice(0, 3).map(d => d.key).join(', ')
  const ranged = outside.length
    ? `${outside.length} of ${result.bins.length} bins fall outside the range a conforming sample of this size shows 95% of the time (${listed}${outside.length > 3 ? ', …' : ''}).`
    : 'No bin falls outside the range a conforming sample of this size shows 95% of the time.'
  switch (result.test) {
    case 'duplicates': {
      const top = result.bins[0]
      const repeated = result.duplicates
      if (!top || !repeated) return `No amount of ${column} occurs more than once among ${count(result.n)} values.`
      return `${count(repeated.repeatedValues)} amounts of ${column} occur more than once, covering ${count(repeated.repeatedRows)} of ${count(result.n)} rows; the most frequent, ${top.key}, appears ${count(top.count)} times.`
    }
    case 'round-numbers': {
      const hundreds = result.bins.find(b => b.key === '00')
      if (!hundreds) return ranged
      return `${percent(hundreds.share)} of ${count(result.n)} amounts of ${column} are whole multiples of 100, where the law predicts ${percent(hundreds.expectedShare ?? 0)}. ${ranged}`
    }
    case 'threshold': {
      const t = result.threshold
      if (!t) return ranged
      return `${count(t.below)} amounts of ${column} fall in the band just under ${t.limit}, where a smooth distribution predicts about ${t.expectedBelow.toFixed(1)}; ${count(t.above)} fall just over it (chance of so many under the limit by luck: p = ${t.pBunching.toPrecision(2)}).`
    }
    case 'summation':
      return `Of ${count(result.n)} amounts of ${column}, the total is spread over the leading pairs with MAD ${result.mad?.value.toFixed(4) ?? '—'}. ${ranged}`
    // Every test is named, so that a new one is a type error here until it has its sentence.
    case 'first-digit':
    case 'second-digit':
    case 'first-two-digits':
    case 'first-three-digits':
    case 'last-two-digits': {
      const conformity = result.mad?.conformity ? CONFORMITY_LABELS[result.mad.conformity] : 'no published conformity range'
      return `${TEST_LABELS[result.test]} of ${count(result.n)} values of ${column}: MAD ${result.mad?.value.toFixed(4) ?? '—'}, ${conformity} with Benford’s law. ${ranged}`
    }
  }
}
