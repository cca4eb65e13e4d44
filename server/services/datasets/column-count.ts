import { DISTRIBUTIONS } from '#shared/digits'
import type { ColumnProfile, DistributionCounts, DistributionTest, SignFilter, StatusCounts } from '#shared/digits'
import { NO_KEY, largest } from './column-layout'
import type { ColumnRecords } from './column-layout'
import { signCode, STATUS_CODES } from './digit-columns'
import type { CodeFilter } from './digit-query'
import { candidates } from './value-buckets'

/** What to count: a distribution test of one sign, the records the filters keep, by the codes of one column. */
export interface CountSpec {
  test: DistributionTest
  sign: SignFilter
  filters: CodeFilter[]
  /** A range of the tested column's values, both ends inclusive, either open (`below`: less than it). */
  range: ValueRange | null
  /** The coded column whose codes make the groups; null for one whole. */
  groupBy: number | null
}

export interface ValueRange { min?: number, max?: number, below?: number }

/** Where a test's key sits among a record's keys (column-records.ts), or -1 for the first three digits. */
const KEY_AT: Record<DistributionTest, number> = { 'first-digit': 0, 'second-digit': 1, 'first-two-digits': 2, 'last-two-digits': 3, 'first-three-digits': -1 }
/** Keys are counted by their own value: one above each test's largest key. */
const KEY_COUNT: Record<DistributionTest, number> = { 'first-digit': 10, 'second-digit': 10, 'first-two-digits': 100, 'last-two-digits': 100, 'first-three-digits': 1000 }
/** Integer-digit counts have a slot each; the values ColumnRecords holds have fewer than 22. */
const LENGTH_SLOTS = 24

/**
 * The records a filter keeps, among `from` (all records when null), as SQL's `code = ANY(…)` and
 * `NOT (…)` keep them: a record with no code passes neither.
 */
function keptBy(codes: Int32Array, filter: CodeFilter, count: number, from: Uint32Array | null): Uint32Array {
  const set = new Uint8Array(largest(filter.codes) + 2)
  for (const code of filter.codes) if (code >= 0) set[code] = 1
  const pass = filter.negate ? 0 : 1
  const out = new Uint32Array(from ? from.length : count)
  let n = 0
  const limit = set.length - 1
  if (from) {
    for (let j = 0; j < from.length; j++) {
      const i = from[j]!
      const code = codes[i]!
      if (code >= 0 && set[code < limit ? code : limit] === pass) out[n++] = i
    }
  }
  else {
    for (let i = 0; i < count; i++) {
      const code = codes[i]!
      if (code >= 0 && set[code < limit ? code : limit] === pass) out[n++] = i
    }
  }
  return out.subarray(0, n)
}

/**
 * The records of a narrow range of the tested column, from the value buckets it touches
 * (value-buckets.ts); null when the range is wide, and is then tested record by record.
 */
function narrowRange(records: ColumnRecords, range: ValueRange): Uint32Array | null {
  const min = range.min ?? -Infinity
  const max = range.max ?? Infinity
  const below = range.below ?? Infinity
  const among = candidates(records.buckets, min, Math.min(max, below), records.count)
  if (!among) return null
  const value = records.value
  const out = new Uint32Array(among.length)
  let n = 0
  for (let j = 0; j < among.length; j++) {
    const v = value[among[j]!]!
    if (v >= min && v <= max && v < below) out[n++] = among[j]!
  }
  return out.subarray(0, n)
}

/**
 * A pass's counts as flat arrays, per group in order of first appearance: the counting thread sends
 * them back as they are (moved, not copied), where a cell per group, each with its list of keys,
 * took longer to pass between threads than to count. countsOfTally makes the cells.
 */
export interface Tally {
  /** Each group's code (-1: records with none). */
  groupKeys: Int32Array
  /** Five status counts per group (blank, unreadable, zero, positive, negative). */
  status: Float64Array
  /** The test's key counts per group, KEY_COUNT of them. */
  keyCounts: Float64Array
  /** The mantissa arc's cos and sin sums per group, for the tests that read it. */
  sums: Float64Array | null
  /** Counted values by number of integer digits. */
  lengths: Float64Array
  profile: Omit<ColumnProfile, 'topValue'> | null
}

/**
 * Counts what SQL's GROUP BY would over the records a question keeps (statusAndDistribution and
 * profileCounts in digit-tests.ts): per group, the status counts, the test's key counts and the
 * mantissa arc's sums; for the whole selection, the suitability facts but the commonest value.
 * Null when a filter or the grouping names a column the records hold no codes of.
 */
export function countRecords(records: ColumnRecords, spec: CountSpec) {
  const tally = tallyRecords(records, spec)
  return tally && countsOfTally(tally, spec)
}

/** countRecords' pass, its counts kept flat (Tally). */
export function tallyRecords(records: ColumnRecords, spec: CountSpec): Tally | null {
  let kept: Uint32Array | null = null
  for (const filter of spec.filters) {
    const codes = records.codes.get(filter.position)
    if (!codes) return null
    kept = keptBy(codes, filter, records.count, kept)
  }
  // A narrow range alone reads its value buckets; any other range is tested in the pass itself.
  let range: ValueRange | null = spec.range
  if (range && !kept) {
    kept = narrowRange(records, range)
    if (kept) range = null
  }
  const ranged = range !== null
  const min = range?.min ?? -Infinity
  const max = range?.max ?? Infinity
  const below = range?.below ?? Infinity
  const groupCodes = spec.groupBy === null ? null : records.codes.get(spec.groupBy)
  if (groupCodes === undefined) return null

  // Groups get dense numbers as they first appear; slot 0 of groupOf stands for a record without a code.
  const groupOf = new Int32Array(groupCodes ? records.largestCode.get(spec.groupBy!)! + 2 : 1).fill(-1)
  const groupKeys: number[] = []
  const keyCount = KEY_COUNT[spec.test]
  // Room for 16 groups, doubled when full; kept in plain locals (no closure), as the loop reads them for every record.
  let room = 16
  let status: Float64Array<ArrayBuffer> = new Float64Array(5 * room)
  let keyCounts = new Float64Array(keyCount * room)
  let sums = new Float64Array(2 * room)

  const wanted = signCode(spec.sign)
  const keyAt = KEY_AT[spec.test]
  // The arc's sums only for the tests that read it (the first-digit family).
  const arc = DISTRIBUTIONS[spec.test].arc
  const { status: statuses, sign: signs, value, keys, firstThree, integerDigits, trailingZeros, fractionDigits, cos, sin } = records
  const lengths = new Float64Array(LENGTH_SLOTS)
  // Read once into locals: the loop below runs for every record.
  const NUMBER = STATUS_CODES.number
  const NONE = NO_KEY
  let n = 0
  let whole = 0
  let round = 0
  let low = Infinity
  let high = -Infinity
  let atLow = 0
  let atHigh = 0
  const total = kept ? kept.length : records.count
  for (let j = 0; j < total; j++) {
    const i = kept ? kept[j]! : j
    const v = value[i]!
    // NaN (no value) passes no range, as SQL's NULL passes no comparison.
    if (ranged && !(v >= min && v <= max && v < below)) continue
    const code = groupCodes ? groupCodes[i]! + 1 : 0
    let g = groupOf[code]!
    if (g < 0) {
      g = groupOf[code] = groupKeys.length
      groupKeys.push(code - 1)
      if (g === room) {
        room *= 2
        status = grown(status, 5 * room)
        keyCounts = grown(keyCounts, keyCount * room)
        sums = grown(sums, 2 * room)
      }
    }
    const s = statuses[i]!
    if (s !== NUMBER) {
      // blank, unreadable and zero are the first three of a group's five status counts.
      status[g * 5 + s]!++
      continue
    }
    const sg = signs[i]!
    status[g * 5 + (sg > 0 ? 3 : 4)]!++
    if (sg !== wanted) continue
    const key = keyAt < 0 ? (firstThree[i] || -1) : (keys[i * 4 + keyAt] === NONE ? -1 : keys[i * 4 + keyAt]!)
    if (key >= 0) {
      keyCounts[g * keyCount + key]!++
      if (arc) {
        sums[g * 2]! += cos[i]!
        sums[g * 2 + 1]! += sin[i]!
      }
    }
    n++
    const length = integerDigits[i]!
    lengths[length < LENGTH_SLOTS ? length : LENGTH_SLOTS - 1]!++
    if (fractionDigits[i] === 0) {
      whole++
      if (trailingZeros[i]! >= 2) round++
    }
    const abs = v < 0 ? -v : v
    if (abs < low) {
      low = abs
      atLow = 1
    }
    else if (abs === low) atLow++
    if (abs > high) {
      high = abs
      atHigh = 1
    }
    else if (abs === high) atHigh++
  }

  // A double's shortest text is the plain decimal for the values ColumnRecords holds.
  const profile: Omit<ColumnProfile, 'topValue'> | null = n
    ? { n, min: String(low), max: String(high), atMin: atLow, atMax: atHigh, whole, roundHundreds: round, commonLength: Math.max(...lengths) }
    : null
  return { groupKeys: Int32Array.from(groupKeys), status, keyCounts, sums: arc ? sums : null, lengths, profile }
}

/** A tally's cells in the engine's shape, its suitability facts, and its counts by number of integer digits. */
export function countsOfTally(tally: Tally, spec: CountSpec) {
  const keyCount = KEY_COUNT[spec.test]
  const cells: { code: number, counts: DistributionCounts }[] = []
  for (let g = 0; g < tally.groupKeys.length; g++) {
    cells.push({ code: tally.groupKeys[g]!, counts: countsOf(tally.status, tally.keyCounts, tally.sums, g, keyCount, spec.sign) })
  }
  // The counts by number of integer digits, for joining these facts to cells' (factsCell in digit-cube.ts).
  const byLength = new Map<number, number>()
  tally.lengths.forEach((count, length) => count && byLength.set(length, count))
  return { cells, profile: tally.profile, lengths: byLength }
}

/** A tally's arrays' memory, to move it to another thread rather than copy it (the pass keeps none of it). */
export function tallyBuffers(tally: Tally): ArrayBuffer[] {
  return [tally.groupKeys, tally.status, tally.keyCounts, tally.sums, tally.lengths].flatMap(array => (array ? [array.buffer as ArrayBuffer] : []))
}

function grown(old: Float64Array, length: number): Float64Array<ArrayBuffer> {
  const next = new Float64Array(length)
  next.set(old)
  return next
}

/**
 * One group's counts in the engine's shape, as SQL's GROUP BY gives them (a null key for values the
 * test has none for); the arc's sums only when they were counted.
 */
function countsOf(status: Float64Array, keyCounts: Float64Array, sums: Float64Array | null, g: number, keyCount: number, sign: SignFilter): DistributionCounts {
  const at = g * 5
  const counted: StatusCounts = { blank: status[at]!, unreadable: status[at + 1]!, zero: status[at + 2]!, positive: status[at + 3]!, negative: status[at + 4]! }
  const keys: DistributionCounts['keys'] = []
  let withKey = 0
  for (let k = 0; k < keyCount; k++) {
    const count = keyCounts[g * keyCount + k]!
    if (!count) continue
    keys.push({ key: k, count })
    withKey += count
  }
  if (counted[sign] > withKey) keys.push({ key: null, count: counted[sign] - withKey })
  return { status: counted, keys, ...(sums && { arc: { cos: sums[g * 2]!, sin: sums[g * 2 + 1]! } }) }
}
