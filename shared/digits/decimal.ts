import { decimalText } from './digit-record'
import { readNumber } from './read-number'

/**
 * An exact decimal, units × 10^-scale, so that sums and bucket edges match PostgreSQL NUMERIC
 * (in floating point, 0.3 / 0.1 floors to 2).
 */
export interface Decimal {
  units: bigint
  scale: number
}

export const DECIMAL_ZERO: Decimal = { units: 0n, scale: 0 }

/** Reads decimal text (as stored or as NUMERIC comes back from SQL) or a JS number. */
export function toDecimal(x: string | number): Decimal {
  const read = readNumber(x)
  if (read.status === 'zero') return DECIMAL_ZERO
  if (read.status !== 'number') throw new RangeError(`Not a number: ${String(x)}`)
  const text = decimalText(read)
  const point = text.indexOf('.')
  if (point < 0) return { units: BigInt(text), scale: 0 }
  return { units: BigInt(text.slice(0, point) + text.slice(point + 1)), scale: text.length - point - 1 }
}

function aligned(a: Decimal, b: Decimal): [bigint, bigint, number] {
  const scale = Math.max(a.scale, b.scale)
  return [a.units * 10n ** BigInt(scale - a.scale), b.units * 10n ** BigInt(scale - b.scale), scale]
}

export function addDecimal(a: Decimal, b: Decimal): Decimal {
  const [x, y, scale] = aligned(a, b)
  return { units: x + y, scale }
}

export function subtractDecimal(a: Decimal, b: Decimal): Decimal {
  return addDecimal(a, { units: -b.units, scale: b.scale })
}

export function multiplyDecimal(a: Decimal, b: Decimal): Decimal {
  return { units: a.units * b.units, scale: a.scale + b.scale }
}

export function absDecimal(a: Decimal): Decimal {
  return a.units < 0n ? { units: -a.units, scale: a.scale } : a
}

export function compareDecimal(a: Decimal, b: Decimal): number {
  const [x, y] = aligned(a, b)
  return x < y ? -1 : x > y ? 1 : 0
}

/** floor(a / b) for b > 0, as SQL floor(a / b) on NUMERIC gives it. */
export function floorDivideDecimal(a: Decimal, b: Decimal): number {
  const [x, y] = aligned(a, b)
  const q = x / y
  return Number(x % y !== 0n && x < 0n ? q - 1n : q)
}

export function decimalToText(a: Decimal): string {
  const negative = a.units < 0n
  const digits = (negative ? -a.units : a.units).toString().padStart(a.scale + 1, '0')
  const integer = digits.slice(0, digits.length - a.scale)
  const fraction = digits.slice(digits.length - a.scale).replace(/0+$/, '')
  const text = fraction ? `${integer}.${fraction}` : integer
  return negative && text !== '0' ? `-${text}` : text
}

export function decimalToNumber(a: Decimal): number {
  return Number(decimalToText(a))
}
