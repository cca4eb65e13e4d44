import { compareDecimal, toDecimal } from '#shared/digits'
import type { ColumnProfile as SuitabilityProfile, DigitRecord } from '#shared/digits'

interface Extreme { abs: number, text: string, count: number }

/**
 * Orders two stored values (a double and the exact decimal text it came from). The double decides
 * unless it ties on different texts: 1e309 and 1e999 are both Infinity, and beyond 17 digits
 * doubles of different values are equal.
 */
export function compareValues(a: number, aText: string, b: number, bText: string): number {
  if (a !== b) return a < b ? -1 : 1
  return aText === bText ? 0 : compareDecimal(toDecimal(aText), toDecimal(bText))
}

/**
 * The column facts the suitability check reads (the engine's ColumnProfile), for the values of one
 * sign, gathered while an import streams past so that an unfiltered test need not scan for them.
 * `topValue` needs every distinct value, so SQL fills it in once the rows are stored.
 */
export class SignProfile {
  n = 0
  whole = 0
  roundHundreds = 0
  private min: Extreme | null = null
  private max: Extreme | null = null
  private readonly lengths = new Map<number, number>()

  add(record: DigitRecord) {
    this.n++
    if (record.fractionDigits === 0) {
      this.whole++
      if (record.trailingZeros >= 2) this.roundHundreds++
    }
    this.lengths.set(record.integerDigits, (this.lengths.get(record.integerDigits) ?? 0) + 1)
    const text = record.sign < 0 ? record.value!.slice(1) : record.value!
    const abs = Number(text)
    const toMin = this.min ? compareValues(abs, text, this.min.abs, this.min.text) : -1
    if (toMin < 0) this.min = { abs, text, count: 1 }
    else if (toMin === 0) this.min!.count++
    const toMax = this.max ? compareValues(abs, text, this.max.abs, this.max.text) : 1
    if (toMax > 0) this.max = { abs, text, count: 1 }
    else if (toMax === 0) this.max!.count++
  }

  toProfile(topValue: number): SuitabilityProfile | null {
    if (!this.n) return null
    return {
      n: this.n, min: this.min!.text, max: this.max!.text, atMin: this.min!.count, atMax: this.max!.count,
      whole: this.whole, roundHundreds: this.roundHundreds, commonLength: Math.max(...this.lengths.values()), topValue,
    }
  }
}
