import { describe, expect, it } from 'vitest'
import { countDistribution, recordsOf, benjaminiHochberg, fibonacciSeries, integerPowerSeries, powerSeries, runDigitTest, checkSuitability, MINIMUM_VALUES } from '#shared/digits'
import type { ColumnProfile } from '#shared/digits'

const codes = (profile: Partial<ColumnProfile>, n = 5000) => checkSuitability({ test: 'first-digit', n, profile: { ...healthy, ...profile } })
  .map(f => `${f.code}:${f.severity}`)

const healthy: ColumnProfile = { n: 5000, min: '0.5', max: '250000', atMin: 1, atMax: 1, whole: 2000, roundHundreds: 40, commonLength: 1500, topValue: 3 }

describe('suitability', () => {
  it('derives each test\'s minimum from Cochran\'s rule: no bin under 1 expected, at most a fifth under 5 (Cochran 1954)', () => {
    // Shares from docs/check-values.md. First digit: one bin of nine may expect under 5, so the second rarest, P(8) = 0.05115, sets it.
    expect(MINIMUM_VALUES['first-digit']).toMatchObject({ warning: Math.ceil(5 / 0.05115), stop: Math.ceil(1 / 0.04576), rarest: '"9"' })
    // Second digit: two of ten may; the third rarest is P(D2 = 7) = 0.09035.
    expect(MINIMUM_VALUES['second-digit']!.warning).toBe(Math.ceil(5 / 0.09035))
    // First two: 18 of 90 may; the 19th rarest is P(81) = log10(1 + 1/81). First three: 180 of 900; the 181st rarest is P(819).
    expect(MINIMUM_VALUES['first-two-digits']!.warning).toBe(Math.ceil(5 / Math.log10(1 + 1 / 81)))
    expect(MINIMUM_VALUES['first-three-digits']!.warning).toBe(Math.ceil(5 / Math.log10(1 + 1 / 819)))
    expect(MINIMUM_VALUES['first-two-digits']!.stop).toBe(Math.ceil(1 / 0.004365))
    expect(MINIMUM_VALUES['last-two-digits']!.warning).toBe(500)
  })

  it('warns below the minimum and stops far below it, naming the rule and its source', () => {
    expect(checkSuitability({ test: 'first-digit', n: 98 })).toEqual([])
    const warning = checkSuitability({ test: 'first-digit', n: 97 })
    expect(warning.map(f => f.severity)).toEqual(['warning'])
    expect(warning[0]!.message).toMatch(/Cochran 1954/)
    expect(checkSuitability({ test: 'first-digit', n: 21 })[0]!.severity).toBe('stop')
    expect(checkSuitability({ test: 'first-three-digits', n: 5000 })[0]!.code).toBe('too-few-values')
  })

  it('sizes the round-numbers test by its rarest bin at the column\'s precision, not by multiples of 100', () => {
    // Whole amounts of four and more digits: multiples of 1,000 are about 1 in 1,000 (the law; docs/check-values.md round shares).
    const whole = Array.from({ length: 3000 }, (_, i) => String(Math.round(10 ** (3 + (3 * i) / 3000))))
    const few = runDigitTest({ test: 'round-numbers', input: { values: whole } }).suitability.find(f => f.code === 'too-few-values')!
    expect(few.message).toContain('multiples of 1,000')
    expect(few.severity).toBe('warning') // about 3 expected
    // In a column of cents, 3,000 values expect well under one multiple of 1,000.00: no reading is possible.
    const cents = whole.map(x => `${x}.37`)
    expect(runDigitTest({ test: 'round-numbers', input: { values: cents } }).suitability.find(f => f.code === 'too-few-values')!.severity).toBe('stop')
    expect(runDigitTest({ test: 'round-numbers', input: { values: [...whole, ...whole, ...whole] } }).suitability.map(f => f.code)).not.toContain('too-few-values')
  })

  it('finds nothing to say about a healthy column', () => {
    expect(codes({})).toEqual([])
    expect(runDigitTest({ test: 'first-digit', input: { values: powerSeries(2, 1000) } }).suitability).toEqual([])
  })

  it('flags a span under three orders of magnitude, and stops under one', () => {
    expect(codes({ min: '10', max: '5000' })).toEqual(['narrow-span:warning'])
    expect(codes({ min: '10', max: '99.9' })).toEqual(['narrow-span:stop'])
  })

  it('flags values that look assigned, a cap, a floor, rounding and repeats', () => {
    expect(codes({ whole: 5000, commonLength: 4600 })).toEqual(['looks-assigned:warning'])
    expect(codes({ atMax: 300 })).toEqual(['pile-up-at-cap:warning'])
    expect(codes({ atMin: 300 })).toEqual(['pile-up-at-floor:warning'])
    expect(codes({ roundHundreds: 600 })).toEqual(['many-round:warning'])
    expect(codes({ topValue: 300 })).toEqual(['many-repeated:warning'])
  })

  it('reads the same findings from values as from a profile', () => {
    const values = [...powerSeries(3, 400).map(String), ...Array.from({ length: 60 }, () => '250')]
    const result = runDigitTest({ test: 'first-digit', input: { values } })
    expect(result.suitability.map(f => f.code)).toEqual(['many-repeated'])
    expect(result.suitability[0]!.message).toContain('13%')
  })

  it('leaves column checks out of tests that do not rest on the law', () => {
    expect(checkSuitability({ test: 'duplicates', n: 3, profile: { ...healthy, topValue: 4000 } })).toEqual([])
  })
})

describe('Benjamini–Hochberg q-values', () => {
  it('rejects four of the fifteen hypotheses in the 1995 paper\'s example at 5% (from memory)', () => {
    const p = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.0000]
    const q = benjaminiHochberg(p)
    expect(q.filter(value => value <= 0.05)).toHaveLength(4)
    // Step-up rule by hand: the largest i with p(i) ≤ 0.05·i/15 is i = 4 (0.0095 ≤ 0.0133; 0.0201 > 0.0167).
    expect(q[3]).toBeCloseTo(0.0095 * 15 / 4, 12)
  })

  it('never lowers a p-value, keeps the order and returns values in input order', () => {
    const p = [0.5, 0.01, 0.03, 0.02]
    const q = benjaminiHochberg(p)
    p.forEach((value, i) => expect(q[i]).toBeGreaterThanOrEqual(value))
    expect(q).toEqual([0.5, 0.04, 0.04, 0.04])
  })
})

describe('groups', () => {
  const items = [
    { key: 'powers of 3', values: powerSeries(3, 600) },
    { key: 'Fibonacci', values: fibonacciSeries(600) },
    { key: 'counting', values: integerPowerSeries(1, 600) },
    { key: 'squares', values: integerPowerSeries(2, 600) },
    { key: 'tiny', values: powerSeries(7, 40) },
  ]

  it('ranks groups by p, reads small ones as too few and gives p and q', () => {
    const withSpeck = [...items, { key: 'speck', values: powerSeries(7, 10) }]
    const result = runDigitTest({ test: 'first-digit', input: { values: withSpeck.flatMap(i => i.values) }, groups: { items: withSpeck.map(({ key, values }) => ({ key, input: { values } })) } })
    // Default minimum: the rarest bin expects one value (22 for the first digit); below the test's minimum (98), "too few".
    expect(result.groupsSkipped).toBe(1)
    expect(result.groups!.map(g => g.key)).not.toContain('speck')
    expect(result.groups!.map(g => g.key).slice(0, 2).sort()).toEqual(['counting', 'squares'])
    const tiny = result.groups!.at(-1)!
    expect([tiny.key, tiny.reading, tiny.conformity]).toEqual(['tiny', 'too-few', null])
    const counting = result.groups!.find(g => g.key === 'counting')!
    expect(counting.reading).toBe('deviates') // 600 values: below the size where the published ranges apply
    expect(counting.conformity).toBeNull()
    expect(counting.q!).toBeLessThan(0.01)
    for (const group of result.groups!) {
      expect(group.q!).toBeGreaterThanOrEqual(group.p!)
      expect(group.excessMad).toBeCloseTo(group.mad! - group.expectedMad!, 15)
    }
    const readable = result.groups!.filter(g => g.reading !== 'too-few').map(g => g.p!)
    expect(readable).toEqual([...readable].sort((a, b) => a - b))
  })

  it('gives the same ranking from per-group counts', () => {
    const fromValues = runDigitTest({ test: 'first-digit', input: { values: [] }, groups: { minSize: 50, items: items.map(({ key, values }) => ({ key, input: { values } })) } })
    const fromCounts = runDigitTest({
      test: 'first-digit',
      input: { values: [] },
      groups: { minSize: 50, items: items.map(({ key, values }) => ({ key, input: { counts: countDistribution('first-digit', recordsOf(values), 'positive') } })) },
    })
    expect(fromCounts.groups).toEqual(fromValues.groups)
    expect(fromValues.groupsSkipped).toBe(1) // 'tiny' has 40 values, under the minSize of 50 asked for
  })

  it('ranks each group by the same MAD and chi-square p as a test of that group alone', () => {
    // Groups are run without the bins' 95% ranges; the ranking must not notice.
    const result = runDigitTest({ test: 'first-two-digits', input: { values: [] }, groups: { minSize: 50, items: items.map(({ key, values }) => ({ key, input: { values } })) } })
    for (const group of result.groups!) {
      const alone = runDigitTest({ test: 'first-two-digits', input: { values: items.find(i => i.key === group.key)!.values } })
      expect(alone.bins.every(bin => bin.low !== null && bin.high !== null)).toBe(true)
      expect([group.n, group.mad, group.p]).toEqual([alone.n, alone.mad!.value, alone.chiSquare!.p])
    }
  })

  it('refuses groups for tests that have no MAD', () => {
    expect(() => runDigitTest({ test: 'duplicates', input: { values: [] }, groups: { items: [] } })).toThrow(RangeError)
  })
})
