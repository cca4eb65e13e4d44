import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { integerPowerSeries, powerSeries, runDigitTest } from '#shared/digits'

/** value × (mantissa · 10^-places), exactly, as decimal text (BigInt, independent of the engine). */
function scale(value: string, mantissa: bigint, places: number): string {
  const digits = (BigInt(value) * mantissa).toString().padStart(places + 1, '0')
  return places === 0 ? digits : `${digits.slice(0, -places)}.${digits.slice(-places)}`
}

const firstDigit = (values: readonly string[]) => runDigitTest({ test: 'first-digit', input: { values } })

// fast-check runs each property dozens of times over thousands of values: seconds on a busy machine.
describe('properties', { timeout: 60_000 }, () => {
  // 2^n, n = 0..999 conforms closely (docs/check-values.md worked case: MAD 0.000678).
  const conforming = powerSeries(2, 1000)

  it('scaling a conforming sample by a constant keeps it conforming (scale invariance; Hill 1995)', () => {
    fc.assert(fc.property(fc.bigInt({ min: 1n, max: 10n ** 12n }), fc.integer({ min: 0, max: 15 }), (mantissa, places) => {
      const result = firstDigit(conforming.map(value => scale(value, mantissa, places)))
      expect(result.n).toBe(1000)
      expect(result.mad!.reading).toBe('chance') // 1000 values: below the size where the published ranges apply
      expect(result.chiSquare!.p).toBeGreaterThan(0.05)
    }), { numRuns: 40 })
  })

  it('the integers 1..N do not conform (docs/check-values.md, a common classroom fact)', () => {
    fc.assert(fc.property(fc.integer({ min: 200, max: 30000 }), (n) => {
      // Below 5,000 values the reading says "deviates" (chi-square p < 0.01); from 5,000 on, the published range.
      expect(firstDigit(integerPowerSeries(1, n)).mad!.reading).toBe(n < 5000 ? 'deviates' : 'nonconforming')
    }), { numRuns: 40 })
  })

  it('repeating a sample keeps its shares and MAD and multiplies chi-square by the repeats', () => {
    fc.assert(fc.property(fc.integer({ min: 2, max: 5 }), fc.integer({ min: 3, max: 9 }), (repeats, base) => {
      const once = firstDigit(powerSeries(base, 300))
      const many = firstDigit(Array.from({ length: repeats }, () => powerSeries(base, 300)).flat())
      expect(many.mad!.value).toBeCloseTo(once.mad!.value, 12)
      expect(many.chiSquare!.statistic).toBeCloseTo(once.chiSquare!.statistic * repeats, 8)
    }), { numRuns: 15 })
  })

  it('every bin\'s 95% range holds its expected count', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 2000 }), fc.constantFrom('first-digit', 'second-digit', 'first-two-digits', 'last-two-digits'), (n, test) => {
      const result = runDigitTest({ test, input: { values: powerSeries(3, n, 2) } })
      for (const bin of result.bins) {
        expect(bin.low!).toBeLessThanOrEqual(Math.ceil(bin.expected!))
        expect(bin.high!).toBeGreaterThanOrEqual(Math.floor(bin.expected!))
      }
    }), { numRuns: 20 })
  })
})
