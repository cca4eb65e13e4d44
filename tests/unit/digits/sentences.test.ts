import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import { summarize } from '../../../shared/charts/summary'
import { DISTRIBUTIONS, runDigitTest } from '#shared/digits'
import type { DistributionTest } from '#shared/digits'
import { jsonColumn } from './open-data'
import { asCounts, logUniform, sampleCounts, seeded } from './simulate'

const movies = jsonColumn('movies.json', 'Worldwide Gross') as Array<number | null>

describe('the sentence under a chart says only what was computed', () => {
  it('gives the count of bins outside their range with the count expected by chance, checked against jStat', () => {
    const random = seeded(19_000)
    for (const test of ['first-digit', 'first-two-digits'] as DistributionTest[]) {
      const { keys, shares } = DISTRIBUTIONS[test]
      const result = runDigitTest({ test, column: 'amount', input: { counts: asCounts(keys, sampleCounts(random, shares, 3000)) } })
      // Independent: P(X < low) + P(X > high) per bin from jStat's binomial CDF.
      let expected = 0
      for (const bin of result.bins) expected += jStat.binomial.cdf(bin.low! - 1, 3000, bin.expectedShare!) + 1 - jStat.binomial.cdf(bin.high!, 3000, bin.expectedShare!)
      expect(result.binsOutside!.expected).toBeCloseTo(expected, 6)
      // Each range covers at least 95%, so fewer than 5% of the bins fall outside by chance (4.5 of 90, 0.45 of 9).
      expect(result.binsOutside!.expected).toBeLessThan(0.05 * keys.length)
      expect(result.binsOutside!.expected).toBeGreaterThan(0.02 * keys.length)
      expect(summarize(result)).toMatch(new RegExp(`(about|fewer than) [0-9.]+( of ${keys.length})? would by chance`))
    }
  })

  it('reads a conforming open-data column as within chance, with its p', () => {
    const result = runDigitTest({ test: 'first-digit', column: 'Worldwide Gross', input: { values: movies } })
    expect(summarize(result)).toContain('MAD 0.0046, within what chance gives when 3,147 values follow Benford’s law (chi-square p = 0.52)')
  })

  it('says "too few values to read" rather than a verdict for a handful of values', () => {
    const result = runDigitTest({ test: 'first-digit', input: { values: ['12', '130', '999'] } })
    expect(summarize(result)).toContain('too few values to read')
    expect(summarize(result)).not.toMatch(/conform/)
  })

  it('compares the last two digits with an even spread, not with Benford’s law, and gives them no KS', () => {
    const result = runDigitTest({ test: 'last-two-digits', input: { values: logUniform(seeded(19_001), 2000, 3, 7) } })
    expect(summarize(result)).toContain('an even spread of endings')
    expect(summarize(result)).not.toContain('Benford')
    expect(result.ks).toBeNull()
  })

  it('mentions no range for the summation test, which computes none', () => {
    const result = runDigitTest({ test: 'summation', input: { values: logUniform(seeded(19_002), 3000) } })
    expect(result.bins.every(bin => bin.low === null && bin.high === null)).toBe(true)
    expect(result.binsOutside).toBeNull()
    expect(summarize(result)).not.toMatch(/95%|range a/)
    expect(summarize(result)).toContain('no chance range')
  })

  it('never rounds a small expected share of round amounts to 0.0%', () => {
    const values = logUniform(seeded(19_003), 3000, 2, 6)
    const result = runDigitTest({ test: 'round-numbers', input: { values } })
    const hundreds = result.bins.find(b => b.key === '00')!
    expect(hundreds.expectedShare).toBeLessThan(0.0005) // cents: multiples of 100.00 are rare
    expect(summarize(result)).not.toContain('0.0%')
    expect(summarize(result)).toMatch(/the law predicts 0\.0[0-9]+%/)
  })

  it('says what the threshold p is, and gives the excess with its interval', () => {
    const values = jsonColumn('movies.json', 'Production Budget') as Array<number | null>
    const result = runDigitTest({ test: 'threshold', column: 'Production Budget', threshold: { limit: '50500000' }, input: { values } })
    const sentence = summarize(result)
    expect(sentence).toContain('94 amounts of “Production Budget” fall in the band just under 50500000')
    expect(sentence).toMatch(/an excess of \+[0-9.]+ \(95% interval −[0-9.]+ to \+[0-9.]+\)/)
    expect(sentence).toContain('where no limit acts, under that trend and the scatter the other bands show: p = 0.17')
    expect(sentence).not.toMatch(/luck|chance that/)
  })
})
