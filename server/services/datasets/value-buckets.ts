import { sharedArray } from './column-layout'

/**
 * A column's records in memory sorted coarsely by value: about a thousand buckets cut at quantiles
 * of a sample, each holding its records' indices in file order. A narrow range (the part of a value
 * ladder's rung a range cuts through, column-count.ts) then reads the few buckets it touches
 * instead of every value of the column.
 */
export interface ValueBuckets {
  /** Ascending cut values: bucket b holds the values v with bounds[b-1] <= v < bounds[b]. */
  bounds: Float64Array
  /** Where each bucket starts in `order`, one more entry than buckets (the end). */
  starts: Uint32Array
  /** The indices of the records with a value (not NaN), bucket by bucket. */
  order: Uint32Array
}

const BUCKETS = 1024
const SAMPLE = 1 << 16

/** How many bounds are at or below v: the bucket that holds v. */
export function bucketOf(bounds: Float64Array, v: number): number {
  let low = 0
  let high = bounds.length
  while (low < high) {
    const mid = (low + high) >> 1
    if (bounds[mid]! <= v) low = mid + 1
    else high = mid
  }
  return low
}

/** The buckets of the first `count` values (NaN: no value, in no bucket). */
export function bucketValues(value: Float64Array, count: number): ValueBuckets {
  let finite = 0
  for (let i = 0; i < count; i++) if (value[i] === value[i]) finite++
  const step = Math.max(1, Math.floor(finite / SAMPLE))
  const sample: number[] = []
  for (let i = 0, seen = 0; i < count; i++) {
    if (value[i] !== value[i]) continue
    if (seen++ % step === 0) sample.push(value[i]!)
  }
  const sorted = Float64Array.from(sample).sort()
  const cuts: number[] = []
  for (let b = 1; b < BUCKETS && sorted.length; b++) {
    const cut = sorted[Math.floor((b * sorted.length) / BUCKETS)]!
    if (cuts.length === 0 || cut > cuts.at(-1)!) cuts.push(cut)
  }
  const bounds = Float64Array.from(cuts)
  const of = new Uint16Array(count)
  const sizes = new Uint32Array(bounds.length + 2)
  for (let i = 0; i < count; i++) {
    if (value[i] !== value[i]) continue
    const b = bucketOf(bounds, value[i]!)
    of[i] = b
    sizes[b + 1]!++
  }
  const starts = new Uint32Array(bounds.length + 2)
  for (let b = 1; b < starts.length; b++) starts[b] = starts[b - 1]! + sizes[b]!
  const next = starts.slice(0, -1)
  const order = sharedArray(Uint32Array, finite)
  for (let i = 0; i < count; i++) if (value[i] === value[i]) order[next[of[i]!]!++] = i
  return { bounds, starts, order }
}

/**
 * The indices of the records in the buckets that can hold values from `low` to `high`, or null when
 * they are more than an eighth of all records (a pass over every value is then quicker than the
 * scattered reads of so many) or no record has a value.
 */
export function candidates(buckets: ValueBuckets, low: number, high: number, count: number): Uint32Array | null {
  if (buckets.order.length === 0) return null
  const first = low === -Infinity ? 0 : bucketOf(buckets.bounds, low)
  const last = high === Infinity ? buckets.starts.length - 2 : bucketOf(buckets.bounds, high)
  if (last < first) return new Uint32Array(0)
  const from = buckets.starts[first]!
  const to = buckets.starts[last + 1]!
  return (to - from) * 8 > count ? null : buckets.order.subarray(from, to)
}
