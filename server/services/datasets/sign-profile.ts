import type { ColumnProfile as SuitabilityProfile, DigitRecord } from '#shared/digits'

interface Extreme { abs: number, text: string, count: number }

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
    const text = record.value!.replace(/^-/, '')
    const abs = Number(text)
    if (!this.min || abs < this.min.abs) this.min = { abs, text, count: 1 }
    else if (abs === this.min.abs) this.min.count++
    if (!this.max || abs > this.max.abs) this.max = { abs, text, count: 1 }
    else if (abs === this.max.abs) this.max.count++
  }

  toProfile(topValue: number): SuitabilityProfile | null {
    if (!this.n) return null
    return {
      n: this.n, min: this.min!.text, max: this.max!.text, atMin: this.min!.count, atMax: this.max!.count,
      whole: this.whole, roundHundreds: this.roundHundreds, commonLength: Math.max(...this.lengths.values()), topValue,
    }
  }
}
