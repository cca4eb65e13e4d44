import { compareDecimal, toDecimal } from '#shared/digits'
import type { Decimal } from '#shared/digits'
import { compareValues } from './sign-profile'

/**
 * A number column's value ladder: its values cut at fixed bounds into rungs, each rung's digit
 * counts kept by the cube (digit-cube.ts) like a text column's value. A range filter on the tested
 * column then adds up the rungs it holds whole, and counts only the records of the one or two rungs
 * it cuts through (from the records in memory, or by the index on column and value). The bounds are
 * the sample's quantiles, so the rungs hold about equal shares of a column whose first rows are like
 * the rest (a file sorted by the column gives lopsided rungs, which stay right and only make its range
 * questions slower), and the round numbers in the sample's span, where ranges usually start and end.
 *
 * Rung r holds the values v with bounds[r-1] <= v < bounds[r] (below the first bound: rung 0; from
 * the last one up: rung bounds.length). Zero is a value like any other; blank and unreadable cells
 * are on no rung, as no range keeps them.
 */
export const LADDER_RUNGS = 64
/** The cube's group_pos of a rung's cell. */
export const LADDER_FINE = -2

export class LadderBounds {
  private readonly numbers: number[]
  constructor(readonly texts: string[]) {
    this.numbers = texts.map(Number)
  }

  /** The rung of a value (its exact decimal text and that text as a double). */
  rungOf(value: number, text: string): number {
    let low = 0
    let high = this.texts.length
    // The first bound above the value: its index is the rung.
    while (low < high) {
      const mid = (low + high) >> 1
      if (compareValues(this.numbers[mid]!, this.texts[mid]!, value, text) <= 0) low = mid + 1
      else high = mid
    }
    return low
  }
}

/**
 * Bounds at the sample values' quantiles (exact decimal texts, signed), and at the round numbers in
 * their span, without repeats; null for too few values. The round numbers (1, 2 and 5 times a power of
 * ten) are there because they are the floors and ceilings a reporter types ("amount ≥ 100", "under
 * 5,000"): a range between round numbers is then answered from the rungs alone.
 */
export function chooseBounds(values: string[]): LadderBounds | null {
  const sorted = values.map(text => ({ text, n: Number(text) })).sort((a, b) => compareValues(a.n, a.text, b.n, b.text))
  if (sorted.length < 2) return null
  const quantiles = Array.from({ length: LADDER_RUNGS - 1 }, (_, i) => sorted[Math.floor(((i + 1) * sorted.length) / LADDER_RUNGS)]!)
  const all = [...quantiles, ...roundNumbersWithin(sorted).map(text => ({ text, n: Number(text) }))]
    .sort((a, b) => compareValues(a.n, a.text, b.n, b.text))
  const bounds: string[] = []
  for (let i = 0; i < all.length; i++) {
    if (i === 0 || compareValues(all[i - 1]!.n, all[i - 1]!.text, all[i]!.n, all[i]!.text) !== 0) bounds.push(all[i]!.text)
  }
  return new LadderBounds(bounds)
}

/** Powers of ten a ladder's round bounds span at most, down from the largest value's. */
const ROUND_DECADES = 12

/** 1, 2 and 5 times each power of ten, of either sign, above the smallest value and up to the largest, as decimal texts. */
function roundNumbersWithin(sorted: readonly { n: number }[]): string[] {
  const low = sorted[0]!.n
  const high = sorted.at(-1)!.n
  let smallest = Infinity
  let largest = 0
  for (const { n } of sorted) {
    const size = Math.abs(n)
    if (size > 0 && size < smallest) smallest = size
    if (size > largest && Number.isFinite(size)) largest = size
  }
  if (!(largest > 0)) return []
  const top = Math.floor(Math.log10(largest))
  const out: string[] = []
  for (let power = Math.max(Math.floor(Math.log10(smallest)), top - ROUND_DECADES + 1); power <= top; power++) {
    for (const digit of ['1', '2', '5']) {
      const text = power >= 0 ? digit + '0'.repeat(power) : `0.${'0'.repeat(-power - 1)}${digit}`
      const value = Number(text)
      if (value > low && value <= high) out.push(text)
      if (-value > low && -value <= high) out.push(`-${text}`)
    }
  }
  return out
}

/** One rung of a ladder, with its bounds (null: open below or above), as texts and as decimals. */
export interface Rung {
  code: number
  low: string | null
  high: string | null
  lowValue: Decimal | null
  highValue: Decimal | null
}

/** The rungs of a ladder with these bounds, worked out once per bounds array (a column's stored facts are kept per server). */
export function rungsOf(bounds: readonly string[]): readonly Rung[] {
  let rungs = rungsKept.get(bounds)
  if (!rungs) {
    const values = bounds.map(toDecimal)
    rungs = Array.from({ length: bounds.length + 1 }, (_, code) => ({
      code,
      low: code === 0 ? null : bounds[code - 1]!,
      high: code >= bounds.length ? null : bounds[code]!,
      lowValue: code === 0 ? null : values[code - 1]!,
      highValue: code >= bounds.length ? null : values[code]!,
    }))
    rungsKept.set(bounds, rungs)
  }
  return rungs
}
const rungsKept = new WeakMap<readonly string[], readonly Rung[]>()

/**
 * How a range [min, max] (inclusive, either open) falls on the rungs: the rungs it holds whole, one
 * after the other, and the parts it cuts from the rungs beside them, as value intervals to count
 * from the records: [min, low) below and [high, max] above. Null when it holds no rung whole.
 */
export function rangeOnRungs(rungs: readonly Rung[], range: { min?: number, max?: number }) {
  const min = range.min === undefined ? null : toDecimal(range.min)
  const max = range.max === undefined ? null : toDecimal(range.max)
  const whole = rungs.filter(r =>
    (min === null || (r.lowValue !== null && compareDecimal(r.lowValue, min) >= 0))
    && (max === null || (r.highValue !== null && compareDecimal(r.highValue, max) <= 0)))
  if (!whole.length) return null
  const { low, lowValue } = whole[0]!
  const high = whole.at(-1)!.high
  return {
    codes: whole.map(r => r.code),
    below: min !== null && low !== null && compareDecimal(lowValue!, min) > 0 ? { min: range.min!, below: low } : null,
    above: max !== null && high !== null ? { from: high, max: range.max! } : null,
  }
}
