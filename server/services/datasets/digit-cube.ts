import { DISTRIBUTIONS, compareDecimal, toDecimal } from '#shared/digits'
import type { ColumnProfile as SuitabilityProfile, Decimal, DigitRecord, DistributionCounts, DistributionTest, SignFilter, StatusCounts } from '#shared/digits'
import type { CopyEncoder } from './copy-encoder'
import { compareValues } from './sign-profile'
import { LADDER_FINE } from './value-ladder'
import type { LadderBounds } from './value-ladder'
import type { ValueLadder } from '#shared/types/dataset'

/**
 * The digit counts of every distribution test, per number column, for the whole column and for
 * each value of the text columns it can be grouped by, counted once while an import streams past
 * and stored in `digit_cube`. An unfiltered test, grouped or not, then reads a few hundred small
 * rows instead of scanning every digit record (a million-row dataset answers in milliseconds).
 * Filtered tests still count the digit records themselves.
 *
 * One cell of the cube is an int[] of counts laid out as: blank, unreadable, zero, positive,
 * negative, then for positive and then negative values the counts of each test's keys in
 * TESTS order, then per sign the suitability facts (whole values, whole multiples of 100, values
 * at the smallest and at the largest, and values per number of integer digits); a float8[] of the
 * mantissa arc's cos and sin sums per sign and test; and a text[] of the smallest and largest
 * absolute value per sign ('' when the sign has none). Filters on one text or date column then
 * answer from the cells they keep, suitability check included, without a scan.
 */
// The order of a cell's key counts; Slots.of reads the fields in the same order.
const TESTS = ['first-digit', 'second-digit', 'first-two-digits', 'first-three-digits', 'last-two-digits'] as const satisfies DistributionTest[]
const FIELDS = TESTS.map((test) => {
  const keys = DISTRIBUTIONS[test].keys.map(Number)
  return { low: keys[0]!, size: keys.length }
})
const OFFSETS = FIELDS.reduce<number[]>((offsets, field, i) => [...offsets, offsets[i]! + field.size], [0])
const PER_SIGN = OFFSETS.at(-1)!
const STATUS_SLOTS = 5
/** Integer-digit counts 0 to 31 have a slot each; the last slot holds every longer value together. */
const LENGTHS = 33
const FACT = { whole: 0, round: 1, atMin: 2, atMax: 3, lengths: 4 } as const
const FACTS_PER_SIGN = FACT.lengths + LENGTHS
const FACTS = STATUS_SLOTS + 2 * PER_SIGN
export const CUBE_LENGTH = FACTS + 2 * FACTS_PER_SIGN
const ARC_LENGTH = 2 * FIELDS.length * 2
const STATUS_SLOT = { blank: 0, unreadable: 1, zero: 2 } as const

/** A text column with more values than this is not counted per value: grouping by it scans. */
const MAX_GROUPS = 5000
/** Cells in memory per import, about 9 KB each, across all number and text columns. */
const MAX_CELLS = 8000
/**
 * Two text columns are also counted together, one cell per pair of values that occurs (department
 * by vendor), so that a filter on one and a grouping by the other need no scan either; a pair with
 * more cells than this stops being counted, and all pairs together keep at most PAIR_CELLS.
 */
const MAX_PAIR_CELLS = 2500
const PAIR_CELLS = 4000
/** Pairs counted per number column at most: each costs a lookup per value. */
const MAX_PAIRS = 6

/**
 * The pairs of text columns worth counting together, from the first rows: both with few values
 * there, the pairs with the fewest combinations first.
 */
export function choosePairs(textPositions: number[], sample: readonly string[][]): [number, number][] {
  const distinct = new Map(textPositions.map(p => [p, new Set(sample.map(row => (row[p] ?? '').trim())).size]))
  const few = textPositions.filter(p => distinct.get(p)! <= Math.min(MAX_PAIR_CELLS, Math.max(10, sample.length / 2)))
  const pairs = few.flatMap((first, i) => few.slice(i + 1).map(second => [first, second] as [number, number]))
  return pairs.filter(([a, b]) => distinct.get(a)! * distinct.get(b)! <= MAX_PAIR_CELLS)
    .sort((x, y) => distinct.get(x[0])! * distinct.get(x[1])! - distinct.get(y[0])! * distinct.get(y[1])!)
    .slice(0, MAX_PAIRS)
}
/** A pair's cell key: the first column's code times this, plus the second's (codes stay under MAX_GROUPS). */
const PAIR_KEY = 8192

/** Every combination of the tests a value has a key for (a value under 10 has no first two digits). */
const MASKS = 1 << FIELDS.length

/** Where one digit record counts in a cell: worked out once, then added to every cell it belongs to. */
class Slots {
  status = 0
  readonly keys = new Int32Array(FIELDS.length)
  length = 0
  /** Which sum of cos and sin the record's arc goes to: its sign and the tests it has keys for. */
  arc = -1
  cos = 0
  sin = 0
  /** A number's side (0 positive, 1 negative; -1 for no number), absolute value and its text, and its facts' slots. */
  side = -1
  abs = 0
  text = ''
  /** The signed value and its text (zero included), for the value ladder; NaN for blank and unreadable cells. */
  value = Number.NaN
  valueText = ''
  readonly facts = new Int32Array(3)
  factCount = 0
  private base = 0
  private mask = 0

  of(r: DigitRecord): this {
    this.length = 0
    this.arc = -1
    this.side = -1
    this.factCount = 0
    this.value = r.value === null ? Number.NaN : Number(r.value)
    this.valueText = r.value ?? ''
    if (r.status !== 'number') {
      this.status = STATUS_SLOT[r.status]
      return this
    }
    const side = r.sign > 0 ? 0 : 1
    this.side = side
    this.text = side ? r.value!.slice(1) : r.value!
    // The same double as Number(text): a minus sign only flips the sign bit.
    this.abs = Math.abs(this.value)
    const facts = FACTS + side * FACTS_PER_SIGN
    this.facts[this.factCount++] = facts + FACT.lengths + Math.min(r.integerDigits, LENGTHS - 1)
    if (r.fractionDigits === 0) {
      this.facts[this.factCount++] = facts + FACT.whole
      if (r.trailingZeros >= 2) this.facts[this.factCount++] = facts + FACT.round
    }
    this.status = 3 + side
    this.base = STATUS_SLOTS + side * PER_SIGN
    this.mask = 0
    // The arc uses the mantissa as PostgreSQL stores it (real), like a count over the records would.
    const angle = 2 * Math.PI * Math.fround(r.mantissa!)
    this.cos = Math.cos(angle)
    this.sin = Math.sin(angle)
    this.key(0, r.firstDigit)
    this.key(1, r.secondDigit)
    this.key(2, r.firstTwo)
    this.key(3, r.firstThree)
    this.key(4, r.lastTwo)
    this.arc = (side * MASKS + this.mask) * 2
    return this
  }

  private key(f: number, key: number | null) {
    if (key === null) return
    this.keys[this.length++] = this.base + OFFSETS[f]! + key - FIELDS[f]!.low
    this.mask |= 1 << f
  }
}

class Cell {
  readonly counts = new Int32Array(CUBE_LENGTH)
  /**
   * Sums of cos and sin per sign and set of tests with a key: one pair per record instead of one
   * per test, summed into each test's pair as the cell is written (arcs).
   */
  private readonly sums = new Float64Array(2 * MASKS * 2)
  /** Per sign, the smallest and largest absolute value, as a double and its exact text. */
  private readonly ends: ({ minAbs: number, min: string, maxAbs: number, max: string } | null)[] = [null, null]

  add(slots: Slots) {
    this.counts[slots.status]!++
    for (let i = 0; i < slots.length; i++) this.counts[slots.keys[i]!]!++
    if (slots.side < 0) return
    for (let i = 0; i < slots.factCount; i++) this.counts[slots.facts[i]!]!++
    this.extremes(slots)
    if (slots.arc < 0) return
    this.sums[slots.arc]! += slots.cos
    this.sums[slots.arc + 1]! += slots.sin
  }

  private extremes({ side, abs, text }: Slots) {
    const facts = FACTS + side * FACTS_PER_SIGN
    const ends = this.ends[side]
    if (!ends) {
      this.ends[side] = { minAbs: abs, min: text, maxAbs: abs, max: text }
      this.counts[facts + FACT.atMin] = 1
      this.counts[facts + FACT.atMax] = 1
      return
    }
    const toMin = compareValues(abs, text, ends.minAbs, ends.min)
    if (toMin < 0) [ends.minAbs, ends.min, this.counts[facts + FACT.atMin]] = [abs, text, 1]
    else if (toMin === 0) this.counts[facts + FACT.atMin]!++
    const toMax = compareValues(abs, text, ends.maxAbs, ends.max)
    if (toMax > 0) [ends.maxAbs, ends.max, this.counts[facts + FACT.atMax]] = [abs, text, 1]
    else if (toMax === 0) this.counts[facts + FACT.atMax]!++
  }

  /**
   * Adds another cell's values: counts and sums add up; per sign the smaller of the two smallest
   * values (and the larger largest) stays, with its count, or both counts when they are equal.
   */
  merge(other: Cell) {
    const ends = [0, 1].map(side => FACTS + side * FACTS_PER_SIGN)
    const before = ends.map(f => [this.counts[f + FACT.atMin]!, this.counts[f + FACT.atMax]!] as const)
    for (let i = 0; i < CUBE_LENGTH; i++) this.counts[i]! += other.counts[i]!
    for (let i = 0; i < this.sums.length; i++) this.sums[i]! += other.sums[i]!
    for (let side = 0; side < 2; side++) {
      const theirs = other.ends[side]
      if (!theirs) continue
      const mine = this.ends[side]
      if (!mine) {
        this.ends[side] = { ...theirs }
        continue
      }
      const [f, [atMin, atMax]] = [ends[side]!, before[side]!]
      const toMin = compareValues(theirs.minAbs, theirs.min, mine.minAbs, mine.min)
      if (toMin < 0) [mine.minAbs, mine.min, this.counts[f + FACT.atMin]] = [theirs.minAbs, theirs.min, other.counts[f + FACT.atMin]!]
      else if (toMin > 0) this.counts[f + FACT.atMin] = atMin
      const toMax = compareValues(theirs.maxAbs, theirs.max, mine.maxAbs, mine.max)
      if (toMax > 0) [mine.maxAbs, mine.max, this.counts[f + FACT.atMax]] = [theirs.maxAbs, theirs.max, other.counts[f + FACT.atMax]!]
      else if (toMax < 0) this.counts[f + FACT.atMax] = atMax
    }
  }

  /** The smallest and largest absolute value per sign: positive min, max, then negative ('' for none). */
  extremeTexts(): string[] {
    return this.ends.flatMap(ends => (ends ? [ends.min, ends.max] : ['', '']))
  }

  /** Per sign and test, the sums of cos and sin over the values with a key in that test. */
  arcs(): Float64Array {
    const arcs = new Float64Array(ARC_LENGTH)
    for (let side = 0; side < 2; side++) {
      for (let mask = 1; mask < MASKS; mask++) {
        const from = (side * MASKS + mask) * 2
        for (let f = 0; f < FIELDS.length; f++) {
          if (!(mask & (1 << f))) continue
          const to = (side * FIELDS.length + f) * 2
          arcs[to]! += this.sums[from]!
          arcs[to + 1]! += this.sums[from + 1]!
        }
      }
    }
    return arcs
  }
}

/**
 * Counts for one number column by one text column: a cell per group code (codes start at 1). While
 * a pair of text columns is counted (`derived`), a grouping of either column is the sum of the pair's
 * cells: its records are not counted a second time, only which codes it has seen (`seen`), and its
 * cells are made from the pair's when they are written or when the pair stops being counted.
 */
interface Grouping {
  position: number
  cells: (Cell | undefined)[]
  derived: boolean
  seen: Uint8Array | null
  /** How many cells it has, made or still derived. */
  size: number
}

/** Counts for one number column by two text columns together: a cell per pair of codes that occurs. */
interface Pairing {
  first: number
  second: number
  cells: Map<number, Cell>
}

/**
 * A number column's value ladder: a cell per rung. A range beside text filters or a grouping is
 * counted from the records in memory instead (column-scan.ts): rungs by each text's code, kept here,
 * made the import's cells several times larger and its counting about a third slower.
 */
interface Ladder {
  bounds: LadderBounds
  fine: (Cell | undefined)[]
}

/**
 * Counts for one number column: the whole column, and per code of each text column (and pair of them)
 * still counted. The first pair stands in for the whole and for the groupings of its two columns
 * while it is counted (Grouping): each record then touches three fewer cells, most of the counting's
 * time being the cells' memory.
 */
class ColumnCube {
  readonly whole = new Cell()
  readonly groupings: Grouping[]
  readonly pairings: Pairing[]
  readonly ladder: Ladder | null
  standIn: Pairing | null

  constructor(textPositions: number[], pairs: [number, number][], bounds: LadderBounds | null) {
    this.pairings = pairs.map(([first, second]) => ({ first, second, cells: new Map<number, Cell>() }))
    this.standIn = this.pairings[0] ?? null
    const derived = (position: number) => this.standIn !== null && (position === this.standIn.first || position === this.standIn.second)
    this.groupings = textPositions.map(position => ({
      position, cells: [], derived: derived(position), seen: derived(position) ? new Uint8Array(MAX_GROUPS + 1) : null, size: 0,
    }))
    this.ladder = bounds && { bounds, fine: [] }
  }

  /** The pair stops standing in: the whole and its groupings get their cells from its cells so far. */
  settle() {
    const pairing = this.standIn
    if (!pairing) return
    this.standIn = null
    for (const grouping of this.groupings.filter(g => g.derived)) {
      const first = grouping.position === pairing.first
      for (const [key, cell] of pairing.cells) (grouping.cells[first ? Math.floor(key / PAIR_KEY) : key % PAIR_KEY] ??= new Cell()).merge(cell)
      grouping.derived = false
      grouping.seen = null
    }
    for (const cell of pairing.cells.values()) this.whole.merge(cell)
  }
}

export class DigitCubeCounter {
  /** By column position; only number columns have one. */
  private readonly columns: (ColumnCube | undefined)[] = []
  private cells = 0
  private pairCells = 0
  private readonly slots = new Slots()

  /** `ladders` holds each number column's ladder bounds by position (none: no ladder). */
  constructor(numberPositions: number[], textPositions: number[], pairs: [number, number][] = [], ladders: (LadderBounds | null)[] = []) {
    for (const position of numberPositions) this.columns[position] = new ColumnCube(textPositions, pairs, ladders[position] ?? null)
  }

  /** Counts one number cell; `codes` are its row's group codes (0: none). */
  add(columnPos: number, r: DigitRecord, codes: Int32Array) {
    const cube = this.columns[columnPos]!
    const slots = this.slots.of(r)
    // Pairs first: when the pair standing in stops here, the whole and its groupings count this record themselves.
    const pairings = cube.pairings
    for (let p = 0; p < pairings.length; p++) {
      const pairing = pairings[p]!
      const [a, b] = [codes[pairing.first]!, codes[pairing.second]!]
      const key = a * PAIR_KEY + b
      let cell = pairing.cells.get(key)
      if (!cell) {
        if (a === 0 || b === 0 || a > MAX_GROUPS || b > MAX_GROUPS || pairing.cells.size >= MAX_PAIR_CELLS || this.pairCells >= PAIR_CELLS) {
          if (pairing === cube.standIn) cube.settle()
          pairings.splice(p--, 1)
          this.pairCells -= pairing.cells.size
          continue
        }
        pairing.cells.set(key, cell = new Cell())
        this.pairCells++
      }
      cell.add(slots)
    }
    if (!cube.standIn) cube.whole.add(slots)
    const groupings = cube.groupings
    for (let g = 0; g < groupings.length; g++) {
      const grouping = groupings[g]!
      const code = codes[grouping.position]!
      let cell = grouping.cells[code]
      if (!cell && !grouping.seen?.[code]) {
        // A column that stopped being coded (code 0: too many values) or has too many groups for
        // the memory kept here is dropped: grouping by it counts the records instead.
        if (code === 0 || code > MAX_GROUPS || this.cells >= MAX_CELLS) {
          this.drop(cube, g)
          g--
          continue
        }
        this.cells++
        grouping.size++
        if (grouping.derived) grouping.seen![code] = 1
        else cell = grouping.cells[code] = new Cell()
      }
      cell?.add(slots)
    }
    if (cube.ladder && !Number.isNaN(slots.value)) this.climb(cube.ladder, slots)
  }

  /** Counts a value on its rung of the ladder. */
  private climb(ladder: Ladder, slots: Slots) {
    ;(ladder.fine[ladder.bounds.rungOf(slots.value, slots.valueText)] ??= new Cell()).add(slots)
  }

  /** A number column's ladder as dataset_columns keeps it: its bounds. */
  ladderOf(columnPos: number): ValueLadder | null {
    const ladder = this.columns[columnPos]?.ladder
    return ladder ? { bounds: ladder.bounds.texts } : null
  }

  private drop(cube: ColumnCube, index: number) {
    const [dropped] = cube.groupings.splice(index, 1)
    this.cells -= dropped!.size
  }

  /** The text columns each number column was counted by; -1 stands for the whole column. */
  groupingsOf(columnPos: number): number[] {
    const cube = this.columns[columnPos]
    return cube ? [-1, ...cube.groupings.map(g => g.position)] : []
  }

  /** The pairs of text columns a number column was counted by, one after the other: [first, second, first, second, …]. */
  pairingsOf(columnPos: number): number[] {
    return this.columns[columnPos]?.pairings.flatMap(p => [p.first, p.second]) ?? []
  }

  write(out: CopyEncoder, dataset: Buffer) {
    this.columns.forEach((cube, columnPos) => {
      if (!cube) return
      cube.settle()
      writeCell(out, dataset, columnPos, { position: -1, code: 0 }, null, cube.whole)
      for (const { position, cells } of cube.groupings) {
        cells.forEach((cell, code) => {
          if (cell) writeCell(out, dataset, columnPos, { position, code }, null, cell)
        })
      }
      for (const { first, second, cells } of cube.pairings) {
        for (const [key, cell] of cells) writeCell(out, dataset, columnPos, { position: first, code: Math.floor(key / PAIR_KEY) }, { position: second, code: key % PAIR_KEY }, cell)
      }
      if (!cube.ladder) return
      cube.ladder.fine.forEach((cell, rung) => {
        if (cell) writeCell(out, dataset, columnPos, { position: LADDER_FINE, code: rung }, null, cell)
      })
    })
  }
}

type CellGroup = { position: number, code: number }

/** One cell: of the whole column (group position -1), of one text column's value, or of a pair of values. */
function writeCell(out: CopyEncoder, dataset: Buffer, columnPos: number, group: CellGroup, pair: CellGroup | null, cell: Cell) {
  out.row(9)
  out.raw(dataset)
  out.int16(columnPos)
  out.int16(group.position)
  out.int32(group.code)
  out.int16(pair?.position ?? -1)
  out.int32(pair?.code ?? 0)
  out.int32Array(cell.counts)
  out.float8Array(cell.arcs())
  const ends = cell.extremeTexts()
  out.textArray(ends, 0, ends.length)
}

export const CUBE_COLUMNS = ['dataset_id', 'column_pos', 'group_pos', 'group_code', 'pair_pos', 'pair_code', 'counts', 'arcs', 'ends']

/**
 * The SQL slices of a cube row that one test and sign need (PostgreSQL arrays count from 1):
 * status counts, the test's key counts, and its arc sums.
 */
export function cubeSlices(test: DistributionTest, sign: SignFilter) {
  const f = TESTS.indexOf(test as typeof TESTS[number])
  const side = sign === 'positive' ? 0 : 1
  const from = STATUS_SLOTS + side * PER_SIGN + OFFSETS[f]! + 1
  const arc = (side * FIELDS.length + f) * 2 + 1
  return {
    status: `counts[1:${STATUS_SLOTS}]`,
    keys: `counts[${from}:${from + FIELDS[f]!.size - 1}]`,
    arc: `arcs[${arc}:${arc + 1}]`,
  }
}

/** One cube row's slices back into the counts the engine takes. */
export function countsFromCube(test: DistributionTest, sign: SignFilter, row: { status: number[], keys: number[], arc: number[] }): DistributionCounts {
  const [blank, unreadable, zero, positive, negative] = row.status as [number, number, number, number, number]
  const status: StatusCounts = { blank, unreadable, zero, positive, negative }
  const { low } = FIELDS[TESTS.indexOf(test as typeof TESTS[number])]!
  const keys: DistributionCounts['keys'] = []
  let counted = 0
  row.keys.forEach((count, i) => {
    if (!count) return
    keys.push({ key: low + i, count })
    counted += count
  })
  // Values too small for the test (under 10 for the first two digits) have no key.
  const withoutKey = status[sign] - counted
  if (withoutKey > 0) keys.push({ key: null, count: withoutKey })
  return { status, keys, arc: { cos: row.arc[0]!, sin: row.arc[1]! } }
}

/** Where one key of a test and sign sits in a cube row's counts, as a PostgreSQL array index (from 1). */
export function cubeKeyIndex(test: DistributionTest, sign: SignFilter, key: number): number {
  const f = TESTS.indexOf(test as typeof TESTS[number])
  return STATUS_SLOTS + (sign === 'positive' ? 0 : PER_SIGN) + OFFSETS[f]! + key - FIELDS[f]!.low + 1
}

/** The SQL slices of a cube row that the suitability facts of one sign need (with the `ends` column). */
export function cubeFactSlices(sign: SignFilter) {
  const side = sign === 'positive' ? 0 : 1
  const from = FACTS + side * FACTS_PER_SIGN + 1
  return { facts: `counts[${from}:${from + FACTS_PER_SIGN - 1}]`, ends: `ends[${2 * side + 1}:${2 * side + 2}]` }
}

/**
 * The suitability facts of the values in some cells (the cells a filter keeps), without topValue,
 * which cells cannot add up: the caller bounds it. Null when the cells hold no value of the sign, or
 * when they were counted before cells kept these facts, or when values with 32 or more integer
 * digits share the last length slot (their commonest length is then not known).
 */
export function profileFromCells(cells: Iterable<{ n: number, facts: readonly number[] | null, ends: readonly string[] | null }>): Omit<SuitabilityProfile, 'topValue'> | null {
  let n = 0
  let whole = 0
  let roundHundreds = 0
  const lengths = new Array<number>(LENGTHS).fill(0)
  let min: { text: string, value: Decimal, count: number } | null = null
  let max: { text: string, value: Decimal, count: number } | null = null
  for (const cell of cells) {
    if (!cell.n) continue
    if (!cell.facts || !cell.ends || cell.facts.length !== FACTS_PER_SIGN) return null
    n += cell.n
    whole += cell.facts[FACT.whole]!
    roundHundreds += cell.facts[FACT.round]!
    for (let i = 0; i < LENGTHS; i++) lengths[i]! += cell.facts[FACT.lengths + i]!
    const [low, high] = cell.ends as [string, string]
    const [lowValue, highValue] = endValues(cell.ends)
    const toMin = min ? compareDecimal(lowValue, min.value) : -1
    if (toMin < 0) min = { text: low, value: lowValue, count: cell.facts[FACT.atMin]! }
    else if (toMin === 0) min!.count += cell.facts[FACT.atMin]!
    const toMax = max ? compareDecimal(highValue, max.value) : 1
    if (toMax > 0) max = { text: high, value: highValue, count: cell.facts[FACT.atMax]! }
    else if (toMax === 0) max!.count += cell.facts[FACT.atMax]!
  }
  if (!n || lengths[LENGTHS - 1]) return null
  return { n, min: min!.text, max: max!.text, atMin: min!.count, atMax: max!.count, whole, roundHundreds, commonLength: Math.max(...lengths) }
}

/** A cell's two ends as decimals, worked out once per ends array (the cells kept per server are frozen: cube-cells.ts). */
function endValues(ends: readonly string[]): readonly [Decimal, Decimal] {
  let values = parsedEnds.get(ends)
  if (!values) parsedEnds.set(ends, values = [toDecimal(ends[0]!), toDecimal(ends[1]!)])
  return values
}
const parsedEnds = new WeakMap<readonly string[], readonly [Decimal, Decimal]>()

/**
 * Suitability facts counted from records (one sign, absolute values) in the layout of a cell's, so
 * that profileFromCells adds them to cells: the values of a range that cut through a rung.
 */
export function factsCell(counted: { n: number, whole: number, round: number, min: string, max: string, atMin: number, atMax: number, lengths: Map<number, number> }) {
  const facts = new Array<number>(FACTS_PER_SIGN).fill(0)
  facts[FACT.whole] = counted.whole
  facts[FACT.round] = counted.round
  facts[FACT.atMin] = counted.atMin
  facts[FACT.atMax] = counted.atMax
  for (const [length, n] of counted.lengths) facts[FACT.lengths + Math.min(length, LENGTHS - 1)]! += n
  return { n: counted.n, facts, ends: [counted.min, counted.max] }
}
