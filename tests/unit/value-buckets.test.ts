import { describe, expect, it } from 'vitest'
import { bucketValues, candidates } from '../../server/services/datasets/value-buckets'
import { seededRandom } from '../../server/services/demo/seeded-random'

// The buckets only narrow where to look: a range must keep exactly the records a pass over every
// value keeps. Checked against that pass itself, over values with many ties, zeros, negatives and
// cells without a value (NaN), for ranges narrow and wide.
const next = seededRandom(11)
const COUNT = 200_000
const values = new Float64Array(COUNT)
for (let i = 0; i < COUNT; i++) {
  const r = next()
  values[i] = r < 0.05 ? Number.NaN : r < 0.08 ? 0 : r < 0.2 ? 125 : Math.round((next() - 0.1) * 10 ** (1 + 4 * next()) * 100) / 100
}
const buckets = bucketValues(values, COUNT)

const inRange = (v: number, low: number, high: number) => v >= low && v <= high
const byPass = (low: number, high: number) => {
  const kept: number[] = []
  for (let i = 0; i < COUNT; i++) if (inRange(values[i]!, low, high)) kept.push(i)
  return kept
}

describe('value buckets', () => {
  it('hold every record with a value once, in ascending buckets', () => {
    expect(buckets.order.length).toBe(values.filter(v => !Number.isNaN(v)).length)
    expect(new Set(buckets.order).size).toBe(buckets.order.length)
    for (let b = 0; b + 1 < buckets.starts.length; b++) {
      for (let j = buckets.starts[b]!; j < buckets.starts[b + 1]!; j++) {
        const v = values[buckets.order[j]!]!
        if (b > 0) expect(v).toBeGreaterThanOrEqual(buckets.bounds[b - 1]!)
        if (b < buckets.bounds.length) expect(v).toBeLessThan(buckets.bounds[b]!)
      }
    }
  })

  const ranges: [number, number][] = [[100, 104.5], [125, 125], [-3, -1], [0, 0], [-Infinity, -500], [9000, Infinity], [50, 60], [1e9, 2e9], [10, 1e5]]
  for (const [low, high] of ranges) {
    it(`keep, for ${low} to ${high}, a superset of what a pass over every value keeps (or answer null: too many)`, () => {
      const found = candidates(buckets, low, high, COUNT)
      const expected = byPass(low, high)
      if (found === null) {
        // Null only where a pass over every value is the quicker: a range that keeps a good share.
        expect(expected.length).toBeGreaterThan(COUNT / 100)
        return
      }
      const kept = [...found].filter(i => inRange(values[i]!, low, high)).sort((a, b) => a - b)
      expect(kept).toEqual(expected)
    })
  }

  it('narrow a narrow range to a small part of the records', () => {
    expect(candidates(buckets, 100, 104.5, COUNT)!.length).toBeLessThan(COUNT / 50)
  })
})
