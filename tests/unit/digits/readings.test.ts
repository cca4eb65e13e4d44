import { describe, expect, it } from 'vitest'
import { DISTRIBUTIONS, MAD_RANGES, MAD_RANGES_FROM, meanAbsoluteDeviation, runDigitTest, MINIMUM_VALUES } from '#shared/digits'
import type { DistributionTest, GroupResult, Reading } from '#shared/digits'
import { jsonColumn } from './open-data'
import { asCounts, logUniform, sampleCounts, seeded } from './simulate'

const TESTS = Object.keys(DISTRIBUTIONS) as DistributionTest[]
const SAYS_DEVIATES = new Set<Reading | null>(['deviates', 'nonconforming'])
/** Sizes from 100 to 5,000, as the acceptance asks. */
const SIZES = [100, 150, 250, 400, 700, 1000, 1500, 2500, 3500, 5000]

function single(test: DistributionTest, counts: number[]) {
  return runDigitTest({ test, input: { counts: asCounts(DISTRIBUTIONS[test].keys, counts) } })
}

/** A grouped table never reads a deviation that its own q does not show, nor "within chance" where q does. */
function expectAgreesWithQ(group: GroupResult) {
  if (group.reading === 'too-few' || group.q === null) return
  if (SAYS_DEVIATES.has(group.reading)) expect(group.q).toBeLessThan(0.05)
  if (group.reading === 'chance') expect(group.q).toBeGreaterThanOrEqual(0.05)
  if (group.reading === 'deviates') expect(group.conformity).toBeNull()
}

// Simulations: a few seconds each alone, more on a machine busy with a build.
describe('readings on samples that follow the law by construction (seeded simulation)', { timeout: 60_000 }, () => {
  it.each(TESTS)('%s: at most 5% of single readings say "deviates", at every size from 100 to 5,000', (test) => {
    const random = seeded(14_000 + TESTS.indexOf(test))
    const shares = DISTRIBUTIONS[test].shares
    for (const n of SIZES) {
      // First three digits: every size here is under its minimum (9,435), and its 900 bins are slow to range.
      const samples = test === 'first-three-digits' ? 20 : 60
      const readings = Array.from({ length: samples }, () => single(test, sampleCounts(random, shares, n)).mad!.reading)
      const deviating = readings.filter(reading => SAYS_DEVIATES.has(reading)).length
      expect(deviating, `${test} at n = ${n}`).toBeLessThanOrEqual(0.05 * samples)
      if (n < MINIMUM_VALUES[test]!.warning) expect(new Set(readings)).toEqual(new Set(['too-few']))
    }
  })

  it.each(TESTS)('%s: at most 5% of grouped readings say a group deviates, and none contradicts its q', (test) => {
    const random = seeded(15_000 + TESTS.indexOf(test))
    const shares = DISTRIBUTIONS[test].shares
    const keys = DISTRIBUTIONS[test].keys
    let deviating = 0
    let readable = 0
    for (let table = 0; table < 6; table++) {
      const items = Array.from({ length: 30 }, (_, i) => {
        const n = Math.round(100 * 50 ** (i / 29)) // 100 … 5,000
        return { key: `g${i}`, input: { counts: asCounts(keys, sampleCounts(random, shares, n)) } }
      })
      const { groups } = runDigitTest({ test, input: { counts: asCounts(keys, keys.map(() => 0)) }, groups: { items } })
      for (const group of groups!) {
        expectAgreesWithQ(group)
        if (group.reading !== 'too-few') readable++
        if (SAYS_DEVIATES.has(group.reading)) deviating++
      }
    }
    expect(deviating).toBeLessThanOrEqual(0.05 * 180)
    if (test !== 'first-three-digits') expect(readable).toBeGreaterThan(0) // first three needs 9,435 values
  })

  it.each(Object.keys(MAD_RANGES) as DistributionTest[])('%s: from the size where its published ranges are read, a conforming sample reads "close" at least 99% of the time', (test) => {
    const random = seeded(16_000 + TESTS.indexOf(test))
    const shares = DISTRIBUTIONS[test].shares
    const closeUpTo = MAD_RANGES[test]![0]
    const closeShare = (n: number, samples: number) => {
      let close = 0
      for (let i = 0; i < samples; i++) {
        const counts = sampleCounts(random, shares, n)
        if (meanAbsoluteDeviation(counts.map(c => c / n), shares) <= closeUpTo) close++
      }
      return close / samples
    }
    const samples = test === 'first-three-digits' ? 400 : 1000
    expect(closeShare(MAD_RANGES_FROM[test]!, samples)).toBeGreaterThanOrEqual(0.985) // 99% less simulation noise
    // At a quarter of that size the ranges would mislabel conforming samples often: the cut-off is not idle.
    expect(closeShare(Math.round(MAD_RANGES_FROM[test]! / 4), samples)).toBeLessThan(0.95)
  })

  it('reads the published range where n is large enough, and only then', () => {
    const random = seeded(17_000)
    const shares = DISTRIBUTIONS['first-digit'].shares
    const large = single('first-digit', sampleCounts(random, shares, 20_000))
    expect(large.mad!.reading).toBe('close')
    expect(large.mad!.conformity).toBe('close')
    // 300 values that follow the law: the published ranges would call about a third of such samples nonconforming.
    const small = single('first-digit', sampleCounts(random, shares, 300))
    expect(small.mad!.reading).toBe('chance')
    expect(small.mad!.conformity).toBeNull()
    // Three values: no verdict at all.
    expect(single('first-digit', [1, 1, 1, 0, 0, 0, 0, 0, 0]).mad!.reading).toBe('too-few')
  })
})

describe('planted deviations of a realistic size are still found', { timeout: 60_000 }, () => {
  it('made-up amounts with flat leading digits in one supplier among thirty', () => {
    const random = seeded(18_000)
    const items = Array.from({ length: 30 }, (_, i) => {
      const n = 300 + 100 * i
      const values = logUniform(random, n)
      // Supplier 12: 40% of its 1,500 amounts keyed by hand, leading digits spread evenly.
      if (i === 12) for (let j = 0; j < 0.4 * n; j++) values[j] = (1000 + 9000 * random()).toFixed(2)
      return { key: `supplier ${i}`, input: { values } }
    })
    for (const test of ['first-digit', 'first-two-digits'] as const) {
      const { groups } = runDigitTest({ test, input: { values: [] }, groups: { items } })
      expect(groups![0]!.key, test).toBe('supplier 12')
      expect(groups![0]!.reading, test).toBe('deviates')
      for (const group of groups!) expectAgreesWithQ(group)
      expect(groups!.filter(g => SAYS_DEVIATES.has(g.reading)).length, test).toBeLessThanOrEqual(2)
    }
  })

  it('one amount paid again and again', () => {
    const random = seeded(18_001)
    const values = [...logUniform(random, 2000), ...Array.from({ length: 60 }, () => '4725.00')]
    const result = runDigitTest({ test: 'first-two-digits', input: { values } })
    expect(result.mad!.reading).toBe('deviates')
    expect(result.bins.find(b => b.key === '47')!.z).toBeGreaterThan(5)
    expect(runDigitTest({ test: 'duplicates', input: { values } }).bins[0]).toMatchObject({ key: '4725', count: 60 })
  })

  it('a share of amounts bunched under a limit', () => {
    const random = seeded(18_002)
    const values = logUniform(random, 3000, 2, 5)
    // 6% of amounts pushed to just under an approval limit of 5,000.
    for (let j = 0; j < 180; j++) values[j] = (4750 + 249 * random()).toFixed(2)
    expect(runDigitTest({ test: 'first-two-digits', input: { values } }).mad!.reading).toBe('deviates')
    const { threshold } = runDigitTest({ test: 'threshold', threshold: { limit: '5000' }, input: { values } })
    expect(threshold!.pBunching).toBeLessThan(0.01)
    expect(threshold!.excessLow).toBeGreaterThan(100) // 180 planted, on top of the bucket's own scatter
    expect(threshold!.excessHigh).toBeGreaterThan(180)
  })
})

describe('the threshold test on smooth samples (seeded simulation)', { timeout: 60_000 }, () => {
  it('reads p < 0.05 about 5% of the time or less where no limit acts, and its 95% interval holds the true excess of 0', () => {
    const random = seeded(18_500)
    let small = 0
    let covered = 0
    const runs = 200
    for (let i = 0; i < runs; i++) {
      // Amounts log-uniform over 100–100,000, counted straight into the ten buckets of width 250 around 5,000.
      const n = 400 + 40 * i
      const buckets = Array.from({ length: 10 }, (_, bucket) => ({ bucket, count: 0 }))
      for (let j = 0; j < n; j++) {
        const x = 10 ** (2 + 3 * random())
        if (x >= 3750 && x < 6250) buckets[Math.floor((x - 3750) / 250)]!.count++
      }
      const status = { blank: 0, unreadable: 0, zero: 0, positive: n, negative: 0 }
      const { threshold } = runDigitTest({ test: 'threshold', threshold: { limit: '5000' }, input: { counts: { status, buckets } } })
      if (threshold!.pBunching < 0.05) small++
      if (threshold!.excessLow <= 0 && threshold!.excessHigh >= 0) covered++
    }
    expect(small).toBeLessThanOrEqual(0.05 * runs + 6) // 5% plus about two standard errors of simulation noise
    expect(covered).toBeGreaterThanOrEqual(0.95 * runs - 8)
  })
})

describe('readings on open data (vega-datasets 3.2.1, movies.json)', () => {
  const rows = JSON.parse(JSON.stringify(jsonColumn('movies.json', 'Worldwide Gross'))) as Array<number | null>
  const genres = jsonColumn('movies.json', 'Major Genre') as Array<string | null>

  it('grouped by genre, no group reads a deviation its q does not show', () => {
    const byGenre = new Map<string, Array<number | null>>()
    rows.forEach((value, i) => {
      const genre = genres[i] ?? ''
      byGenre.set(genre, [...(byGenre.get(genre) ?? []), value])
    })
    const items = [...byGenre].map(([key, values]) => ({ key, input: { values } }))
    for (const test of ['first-digit', 'second-digit', 'first-two-digits'] as const) {
      const { groups } = runDigitTest({ test, input: { values: rows }, groups: { items } })
      expect(groups!.length).toBeGreaterThan(5)
      for (const group of groups!) expectAgreesWithQ(group)
      // The whole column conforms (docs/check-values.md), and so no genre stands out in the first-digit test.
      if (test === 'first-digit') expect(groups!.filter(g => SAYS_DEVIATES.has(g.reading))).toEqual([])
    }
  })
})
