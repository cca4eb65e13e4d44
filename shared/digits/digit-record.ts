import { DOT_STYLE, readNumber, type ReadNumber } from './read-number'
import type { DigitRecord, NumberStyle } from './types'

const EMPTY: Omit<DigitRecord, 'status'> = {
  sign: 0,
  value: null,
  firstDigit: null,
  secondDigit: null,
  firstTwo: null,
  firstThree: null,
  lastTwo: null,
  integerDigits: 0,
  trailingZeros: 0,
  fractionDigits: 0,
  mantissa: null,
}

const RECORD_BLANK: DigitRecord = { ...EMPTY, status: 'blank' }
const RECORD_UNREADABLE: DigitRecord = { ...EMPTY, status: 'unreadable' }
const RECORD_ZERO: DigitRecord = { ...EMPTY, status: 'zero', value: '0' }

/**
 * The flat record the server stores for one cell at import and later counts with GROUP BY.
 * The second digit of a value with one significant digit is 0, because 5 is 5.0: this follows the
 * definition of the k-th significant digit through the mantissa (Hill 1995, Statistical Science
 * 10(4); from memory), under which D2(5) = 0.
 */
export function toDigitRecord(cell: string | number | null | undefined, style: NumberStyle = DOT_STYLE): DigitRecord {
  return recordOf(readNumber(cell, style))
}

/** The same record from an already read number. */
export function recordOf(read: ReadNumber): DigitRecord {
  if (read.status === 'blank') return RECORD_BLANK
  if (read.status === 'unreadable') return RECORD_UNREADABLE
  if (read.status === 'zero') return RECORD_ZERO

  const { digits, exponent } = read
  const length = digits.length
  const integerDigits = exponent >= 0 ? exponent + 1 : 0
  const fractionDigits = Math.max(0, length - 1 - exponent)

  const d1 = digitAt(digits, 0)
  const d2 = digitAt(digits, 1)
  const d3 = digitAt(digits, 2)
  return {
    status: 'number',
    sign: read.negative ? -1 : 1,
    value: decimalText(read),
    firstDigit: d1,
    secondDigit: d2,
    firstTwo: exponent >= 1 ? d1 * 10 + d2 : null,
    firstThree: exponent >= 2 ? d1 * 100 + d2 * 10 + d3 : null,
    lastTwo: exponent >= 1 ? lastTwoOfInteger(digits, integerDigits) : null,
    integerDigits,
    trailingZeros: trailingZerosOfInteger(digits, integerDigits),
    fractionDigits,
    mantissa: mantissaOf(digits),
  }
}

/** Exact decimal text of a read number, without exponent: "-1234.5", "0.00012". */
export function decimalText(read: ReadNumber): string {
  if (read.status === 'zero') return '0'
  const { digits, exponent } = read
  const sign = read.negative ? '-' : ''
  if (exponent < 0) return `${sign}0.${'0'.repeat(-exponent - 1)}${digits}`
  const integerDigits = exponent + 1
  if (digits.length <= integerDigits) return sign + digits + '0'.repeat(integerDigits - digits.length)
  return `${sign}${digits.slice(0, integerDigits)}.${digits.slice(integerDigits)}`
}

function trailingZerosOfInteger(digits: string, integerDigits: number): number {
  // Significant digits never end in 0, so an integer part longer than them ends in exactly the padding.
  if (integerDigits >= digits.length) return integerDigits - digits.length
  let zeros = 0
  while (zeros < integerDigits && digits.charCodeAt(integerDigits - 1 - zeros) === 48) zeros++
  return zeros
}

function lastTwoOfInteger(digits: string, integerDigits: number): number {
  return digitAt(digits, integerDigits - 2) * 10 + digitAt(digits, integerDigits - 1)
}

/** The digit at a position of the integer part; positions past the significant digits are 0. */
function digitAt(digits: string, position: number): number {
  return position < digits.length ? digits.charCodeAt(position) - 48 : 0
}

/**
 * frac(log10 |x|) from the first 15 significant digits (all a double holds exactly as an integer).
 * Rounding can give 1 for 9.99…9, the same point on the circle as 0.
 */
export function mantissaOf(digits: string): number {
  const head = digits.length > 15 ? digits.slice(0, 15) : digits
  const m = Math.log10(Number(head)) - (head.length - 1)
  return m >= 1 || m < 0 ? 0 : m
}
