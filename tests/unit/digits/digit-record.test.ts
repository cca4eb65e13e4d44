import { describe, expect, it } from 'vitest'
import { toDigitRecord, COMMA_STYLE } from '#shared/digits'

describe('the digit record of one cell', () => {
  it('holds every digit field of an ordinary amount', () => {
    expect(toDigitRecord('$12,340.50')).toEqual({
      status: 'number',
      sign: 1,
      value: '12340.5',
      firstDigit: 1,
      secondDigit: 2,
      firstTwo: 12,
      firstThree: 123,
      lastTwo: 40,
      integerDigits: 5,
      trailingZeros: 1,
      fractionDigits: 1,
      mantissa: expect.closeTo(Math.log10(1.23405), 12),
    })
  })

  it('reads the cell in the column style it is given', () => {
    expect(toDigitRecord('1.234,5', COMMA_STYLE).value).toBe('1234.5')
    expect(toDigitRecord('-7,25', COMMA_STYLE)).toMatchObject({ sign: -1, value: '-7.25', firstDigit: 7, secondDigit: 2 })
  })

  it('gets 1000 right where log10 does not', () => {
    // docs/check-values.md: Math.log(1000)/Math.LN10 = 2.9999999999999996, which a log-based reader turns into digit "10".
    expect(toDigitRecord(1000)).toMatchObject({ firstDigit: 1, secondDigit: 0, firstTwo: 10, firstThree: 100, integerDigits: 4, trailingZeros: 3, lastTwo: 0, mantissa: 0 })
  })

  it('gives a one-digit value the second digit 0 (5 is 5.0) and no first two digits', () => {
    expect(toDigitRecord('5')).toMatchObject({ firstDigit: 5, secondDigit: 0, firstTwo: null, firstThree: null, lastTwo: null })
    expect(toDigitRecord('0.5')).toMatchObject({ firstDigit: 5, secondDigit: 0, integerDigits: 0, fractionDigits: 1 })
  })

  it('applies the "values ≥ 10" and "≥ 100" rules to the two- and three-digit fields', () => {
    expect(toDigitRecord('9.99')).toMatchObject({ firstTwo: null, lastTwo: null })
    expect(toDigitRecord('10')).toMatchObject({ firstTwo: 10, firstThree: null, lastTwo: 10 })
    expect(toDigitRecord('99.5')).toMatchObject({ firstTwo: 99, firstThree: null, lastTwo: 99 })
    expect(toDigitRecord('100')).toMatchObject({ firstTwo: 10, firstThree: 100, lastTwo: 0 })
  })

  it('takes the last two digits and trailing zeros from the integer part only', () => {
    expect(toDigitRecord('1205.75')).toMatchObject({ lastTwo: 5, trailingZeros: 0, fractionDigits: 2 })
    expect(toDigitRecord('3000.01')).toMatchObject({ lastTwo: 0, trailingZeros: 3, fractionDigits: 2 })
    expect(toDigitRecord('1200.00')).toMatchObject({ value: '1200', trailingZeros: 2, fractionDigits: 0 })
    expect(toDigitRecord('0.0012')).toMatchObject({ integerDigits: 0, trailingZeros: 0, fractionDigits: 4 })
  })

  it('writes exact decimal text for a NUMERIC column, without exponent', () => {
    expect(toDigitRecord(1e21).value).toBe(`1${'0'.repeat(21)}`)
    expect(toDigitRecord(1e-7).value).toBe('0.0000001')
    expect(toDigitRecord('123456789012345678901234567890').value).toBe('123456789012345678901234567890')
    expect(toDigitRecord('(0.50)').value).toBe('-0.5')
  })

  it('keeps the mantissa in [0, 1) even when rounding reaches 10', () => {
    expect(toDigitRecord('9'.repeat(40)).mantissa).toBe(0)
    expect(toDigitRecord('2').mantissa).toBeCloseTo(0.30103, 5)
  })

  it('marks blank, unreadable and zero cells without digits', () => {
    for (const [cell, status] of [['', 'blank'], ['abc', 'unreadable'], ['0.00', 'zero']] as const) {
      expect(toDigitRecord(cell)).toMatchObject({ status, sign: 0, firstDigit: null, secondDigit: null, mantissa: null })
    }
  })
})
