import type { CellStatus, DISTRIBUTIONS, DistributionTest, SignFilter, StatusCounts } from '#shared/digits'

// How digit_records (migration 0002) stores a digit record: its status and sign codes and the
// column of each digit field. The import writes them (copy-encoder.ts) and every query reads them here.

/** The smallint in digit_records.status for each cell status. */
export const STATUS_CODES = { blank: 0, unreadable: 1, zero: 2, number: 3 } as const satisfies Record<CellStatus, number>

/** The smallint in digit_records.sign for a number of this sign (0 is blank, unreadable and zero). */
export function signCode(sign: SignFilter): 1 | -1 {
  return sign === 'positive' ? 1 : -1
}

const COUNTED_AS: Record<number, keyof StatusCounts> = { [STATUS_CODES.blank]: 'blank', [STATUS_CODES.unreadable]: 'unreadable', [STATUS_CODES.zero]: 'zero' }

/** Where a stored (status, sign) pair is counted in the engine's StatusCounts. */
export function statusCountOf(status: number, sign: number): keyof StatusCounts {
  if (status === STATUS_CODES.number) return sign > 0 ? 'positive' : 'negative'
  const counted = COUNTED_AS[status]
  if (!counted) throw new RangeError(`digit_records.status ${status} is no known status`)
  return counted
}

/** SQL: the records of `alias` that are numbers of this sign. */
export function numbersOfSign(sign: SignFilter, alias = 'd'): string {
  return `${alias}.status = ${STATUS_CODES.number} AND ${alias}.sign = ${signCode(sign)}`
}

/** The digit_records column of each digit field a distribution test counts. */
export const FIELD_COLUMNS = {
  firstDigit: 'first_digit', secondDigit: 'second_digit', firstTwo: 'first_two', firstThree: 'first_three', lastTwo: 'last_two',
} as const satisfies Record<typeof DISTRIBUTIONS[DistributionTest]['field'], string>
