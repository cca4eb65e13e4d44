import { MAD_RANGES_FROM } from '../digits'
import type { DistributionTest, TestResult } from '../digits'
import { CONFORMITY_LABELS, referenceOf, TEST_LABELS } from './labels'
import { chartData } from './digit-chart'
import { formatP } from './p-value'

const count = (n: number) => n.toLocaleString('en-GB')

/** A share as a percentage that never rounds a small expectation to "0.0%". */
function percent(share: number): string {
  if (share === 0) return '0%'
  const value = share * 100
  return `${value >= 10 ? value.toFixed(1) : Number(value.toPrecision(2))}%`
}

/** A count difference with its sign, one decimal: "+41.4", "−2.4". */
function signed(value: number): string {
  const text = Math.abs(value).toFixed(1)
  return text === '0.0' ? '0.0' : `${value < 0 ? '−' : '+'}${text}`
}

/** "about 4.5", or "fewer than 0.1" for an expectation that would print as 0.0. */
function about(expected: number): string {
  return expected < 0.05 ? 'fewer than 0.1' : `about ${expected.toFixed(1)}`
}

/** The bins outside their 95% range, always with the number expected by chance. */
function outsideSentence(result: TestResult, reference: string): string {
  const outside = result.binsOutside
  if (!outside) return ''
  const range = `the range a sample of this size that follows ${reference} shows 95% of the time`
  if (outside.count === 0) return `No bin falls outside ${range} (${about(outside.expected)} of ${result.bins.length} would by chance).`
  const keys = chartData(result).filter(d => d.outside).map(d => d.key)
  const listed = `${keys.slice(0, 3).join(', ')}${keys.length > 3 ? ', …' : ''}`
  const verb = outside.count === 1 ? 'falls' : 'fall'
  return `${outside.count} of ${result.bins.length} bins ${verb} outside ${range} (${listed}); ${about(outside.expected)} would by chance.`
}

function readingPhrase(result: TestResult & { test: DistributionTest }): string {
  const reference = referenceOf(result.test)
  const chance = result.chiSquare ? ` (chi-square ${formatP(result.chiSquare.p)})` : ''
  switch (result.mad?.reading ?? null) {
    case null:
      return 'no reading'
    case 'too-few':
      return 'too few values to read'
    case 'chance':
      return `within what chance gives when ${count(result.n)} values follow ${reference}${chance}`
    case 'deviates':
      return `a departure from ${reference} larger than chance explains at this size${chance}`
    default:
      return `${CONFORMITY_LABELS[result.mad!.conformity!]} with ${reference} by Nigrini’s ranges, which apply from ${count(MAD_RANGES_FROM[result.test]!)} values`
  }
}

/**
 * One or two sentences saying what a chart shows, for readers and screen readers. Each states only
 * what was computed: a range only where one was, the count outside it with the count expected by
 * chance, and a reading only at a size where it means what it says. They describe; they never
 * accuse: a digit test is a screen, not proof.
 */
export function summarize(result: TestResult): string {
  const column = result.column ? `“${result.column}”` : 'the column'
  if (result.n === 0) return `No values of ${column} could be tested.`
  switch (result.test) {
    case 'duplicates': {
      const top = result.bins[0]
      const repeated = result.duplicates
      if (!top || !repeated) return `No amount of ${column} occurs more than once among ${count(result.n)} values.`
      return `${count(repeated.repeatedValues)} amounts of ${column} occur more than once, covering ${count(repeated.repeatedRows)} of ${count(result.n)} rows; the most frequent, ${top.key}, appears ${count(top.count)} times.`
    }
    case 'round-numbers': {
      const hundreds = result.bins.find(b => b.key === '00')
      const ranged = outsideSentence(result, 'the law at the column’s precision')
      if (!hundreds) return ranged
      return `${percent(hundreds.share)} of ${count(result.n)} amounts of ${column} are whole multiples of 100, where the law predicts ${percent(hundreds.expectedShare ?? 0)} for amounts of these lengths. ${ranged}`
    }
    case 'threshold': {
      const t = result.threshold
      if (!t) return ''
      const predicted = `${count(t.below)} amounts of ${column} fall in the band just under ${t.limit}, where the trend through the other eight bands predicts about ${t.expectedBelow.toFixed(1)}`
      // Results stored before the scatter model have no excess; say only what they hold.
      if (t.excess === undefined) return `${predicted}; ${count(t.above)} fall just over it.`
      return `${predicted}: an excess of ${signed(t.excess)} (95% interval ${signed(t.excessLow)} to ${signed(t.excessHigh)}); ${count(t.above)} fall just over it. `
        + `How often an excess at least this large turns up where no limit acts, under that trend and the scatter the other bands show: ${formatP(t.pBunching)}.`
    }
    case 'summation': {
      const top = [...result.bins].sort((a, b) => b.share - a.share)[0]!
      const few = result.mad?.reading === 'too-few' ? ' Too few values to read: with so few amounts, single large ones dominate the shares.' : ''
      return `Of ${count(result.n)} amounts of ${column}, the leading pair with the largest share of the total is ${top.key}, with ${percent(top.share)}, where each pair would hold ${percent(1 / 90)} if the amounts followed the law; MAD ${result.mad?.value.toFixed(4) ?? '—'}. This test has no chance range: read the rows behind the largest pairs.${few}`
    }
    // Every test is named, so that a new one is a type error here until it has its sentence.
    case 'first-digit':
    case 'second-digit':
    case 'first-two-digits':
    case 'first-three-digits':
    case 'last-two-digits': {
      const decimals = result.test === 'first-two-digits' || result.test === 'first-three-digits' ? 5 : 4
      const mad = result.mad ? `MAD ${result.mad.value.toFixed(decimals)}, ` : ''
      return `${TEST_LABELS[result.test]} of ${count(result.n)} values of ${column}: ${mad}${readingPhrase(result as TestResult & { test: DistributionTest })}. ${outsideSentence(result, referenceOf(result.test))}`
    }
  }
}
