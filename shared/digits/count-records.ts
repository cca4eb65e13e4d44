import { absDecimal, addDecimal, DECIMAL_ZERO, decimalToText, toDecimal, type Decimal } from './decimal'
import { decimalText, toDigitRecord } from './digit-record'
import { DISTRIBUTIONS } from './distribution-tests'
import { addToArc } from './mantissa-arc'
import { readNumber, type ReadNumber } from './read-number'
import { thresholdBand, thresholdBucket } from './threshold'
import type {
  ColumnProfile, DigitRecord, DistributionCounts, DistributionTest, DuplicateCounts, NumberStyle, RoundCounts, SignFilter,
  StatusCounts, SummationCounts, ThresholdCounts, ThresholdOptions,
} from './types'

/*
 * The GROUP BY queries of types.ts, done in memory over digit records. The engine's values path
 * runs through these, so a test on values and a test on the server's counts share every statistic.
 */

export type Cell = string | number | null | undefined

export function recordsOf(cells: readonly Cell[], style?: NumberStyle): DigitRecord[] {
  return cells.map(cell => toDigitRecord(cell, style))
}

export function statusCountsOf(records: readonly DigitRecord[]): StatusCounts {
  const status: StatusCounts = { blank: 0, unreadable: 0, zero: 0, positive: 0, negative: 0 }
  for (const record of records) {
    if (record.status !== 'number') status[record.status]++
    else if (record.sign > 0) status.positive++
    else status.negative++
  }
  return status
}

function largest(counts: Iterable<number>): number {
  let max = 0
  for (const count of counts) max = Math.max(max, count)
  return max
}

function ofSign(records: readonly DigitRecord[], sign: SignFilter): DigitRecord[] {
  const wanted = sign === 'positive' ? 1 : -1
  return records.filter(record => record.status === 'number' && record.sign === wanted)
}

function tally<K>(map: Map<K, number>, key: K, count = 1): void {
  map.set(key, (map.get(key) ?? 0) + count)
}

export function countDistribution(test: DistributionTest, records: readonly DigitRecord[], sign: SignFilter): DistributionCounts {
  const field = DISTRIBUTIONS[test].field
  const byKey = new Map<number | null, number>()
  const arc = { cos: 0, sin: 0 }
  for (const record of ofSign(records, sign)) {
    const key = record[field]
    tally(byKey, key)
    if (key !== null) addToArc(arc, record.mantissa!)
  }
  return { status: statusCountsOf(records), keys: [...byKey].map(([key, count]) => ({ key, count })), arc }
}

export function countSummation(records: readonly DigitRecord[], sign: SignFilter): SummationCounts {
  const byKey = new Map<number | null, { count: number, amount: Decimal }>()
  for (const record of ofSign(records, sign)) {
    const entry = byKey.get(record.firstTwo) ?? { count: 0, amount: DECIMAL_ZERO }
    byKey.set(record.firstTwo, { count: entry.count + 1, amount: addDecimal(entry.amount, absDecimal(toDecimal(record.value!))) })
  }
  return {
    status: statusCountsOf(records),
    keys: [...byKey].map(([key, { count, amount }]) => ({ key, count, amount: decimalToText(amount) })),
  }
}

function valueCounts(records: readonly DigitRecord[]): Map<string, number> {
  const byValue = new Map<string, number>()
  for (const record of records) tally(byValue, record.value!)
  return byValue
}

export function countDuplicates(records: readonly DigitRecord[], sign: SignFilter): DuplicateCounts {
  const byValue = valueCounts(ofSign(records, sign))
  const top = [...byValue].filter(([, count]) => count > 1).map(([value, count]) => ({ value, count }))
  return {
    status: statusCountsOf(records),
    distinct: byValue.size,
    repeated: { values: top.length, rows: top.reduce((sum, entry) => sum + entry.count, 0) },
    top,
  }
}

export function countRound(records: readonly DigitRecord[], sign: SignFilter): RoundCounts {
  const byCell = new Map<string, RoundCounts['cells'][number]>()
  for (const { integerDigits, trailingZeros, fractionDigits } of ofSign(records, sign)) {
    const key = `${integerDigits}:${trailingZeros}:${fractionDigits}`
    const cell = byCell.get(key) ?? { integerDigits, trailingZeros, fractionDigits, count: 0 }
    cell.count++
    byCell.set(key, cell)
  }
  return { status: statusCountsOf(records), cells: [...byCell.values()] }
}

export function countThreshold(records: readonly DigitRecord[], sign: SignFilter, options: ThresholdOptions): ThresholdCounts {
  const band = thresholdBand(options)
  const byBucket = new Map<number, number>()
  for (const record of ofSign(records, sign)) {
    const bucket = thresholdBucket(band, toDecimal(record.value!))
    if (bucket !== null) tally(byBucket, bucket)
  }
  return { status: statusCountsOf(records), buckets: [...byBucket].map(([bucket, count]) => ({ bucket, count })) }
}

/** Compares |a| and |b| by order of magnitude, then digits (significant digits never end in 0). */
function compareMagnitude(a: ReadNumber, b: ReadNumber): number {
  if (a.exponent !== b.exponent) return a.exponent - b.exponent
  return a.digits < b.digits ? -1 : a.digits > b.digits ? 1 : 0
}

/** The column facts suitability needs, from records (the server gets them from SQL; see ColumnProfile). */
export function profileOf(records: readonly DigitRecord[], sign: SignFilter): ColumnProfile {
  const numbers = ofSign(records, sign)
  const profile: ColumnProfile = {
    n: numbers.length, min: '0', max: '0', atMin: 0, atMax: 0, whole: 0, roundHundreds: 0, commonLength: 0, topValue: 0,
  }
  if (numbers.length === 0) return profile
  const magnitudes = numbers.map(record => readNumber(record.value!))
  const min = magnitudes.reduce((a, b) => (compareMagnitude(b, a) < 0 ? b : a))
  const max = magnitudes.reduce((a, b) => (compareMagnitude(b, a) > 0 ? b : a))
  const lengths = new Map<number, number>()
  for (const record of numbers) {
    tally(lengths, record.integerDigits)
    if (record.fractionDigits === 0) {
      profile.whole++
      if (record.trailingZeros >= 2) profile.roundHundreds++
    }
  }
  profile.min = decimalText({ ...min, negative: false })
  profile.max = decimalText({ ...max, negative: false })
  profile.atMin = magnitudes.filter(a => compareMagnitude(a, min) === 0).length
  profile.atMax = magnitudes.filter(a => compareMagnitude(a, max) === 0).length
  profile.commonLength = largest(lengths.values())
  profile.topValue = largest(valueCounts(numbers).values())
  return profile
}
