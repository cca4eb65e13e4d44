import { DISTRIBUTIONS } from '#shared/digits'
import type { DigitRecord, DistributionCounts, DistributionTest, SignFilter, StatusCounts } from '#shared/digits'
import type { CopyEncoder } from './copy-encoder'

/**
 * The digit counts of every distribution test, per number column, for the whole column and for
 * each value of the text columns it can be grouped by, counted once while an import streams past
 * and stored in `digit_cube`. An unfiltered test, grouped or not, then reads a few hundred small
 * rows instead of scanning every digit record (a million-row dataset answers in milliseconds).
 * Filtered tests still count the digit records themselves.
 *
 * One cell of the cube is an int[] of counts laid out as: blank, unreadable, zero, positive,
 * negative, then for positive and then negative values the counts of each test's keys in
 * TESTS order; and a float8[] of the mantissa arc's cos and sin sums per sign and test.
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
export const CUBE_LENGTH = STATUS_SLOTS + 2 * PER_SIGN
const ARC_LENGTH = 2 * FIELDS.length * 2
const STATUS_SLOT = { blank: 0, unreadable: 1, zero: 2 } as const

/** A text column with more values than this is not counted per value: grouping by it scans. */
const MAX_GROUPS = 5000
/** Cells in memory per import, about 9 KB each, across all column pairs. */
const MAX_CELLS = 8000

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
  private base = 0
  private mask = 0

  of(r: DigitRecord): this {
    this.length = 0
    this.arc = -1
    if (r.status !== 'number') {
      this.status = STATUS_SLOT[r.status]
      return this
    }
    const side = r.sign > 0 ? 0 : 1
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

  add(slots: Slots) {
    this.counts[slots.status]!++
    for (let i = 0; i < slots.length; i++) this.counts[slots.keys[i]!]!++
    if (slots.arc < 0) return
    this.sums[slots.arc]! += slots.cos
    this.sums[slots.arc + 1]! += slots.sin
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

/** Counts for one number column by one text column: a cell per group code (codes start at 1). */
interface Grouping {
  position: number
  cells: (Cell | undefined)[]
}

/** Counts for one number column: the whole column, and per code of each text column still counted. */
class ColumnCube {
  readonly whole = new Cell()
  readonly groupings: Grouping[]

  constructor(textPositions: number[]) {
    this.groupings = textPositions.map(position => ({ position, cells: [] }))
  }
}

export class DigitCubeCounter {
  /** By column position; only number columns have one. */
  private readonly columns: (ColumnCube | undefined)[] = []
  private cells = 0
  private readonly slots = new Slots()

  constructor(numberPositions: number[], textPositions: number[]) {
    for (const position of numberPositions) this.columns[position] = new ColumnCube(textPositions)
  }

  /** Counts one number cell; `codes` are its row's group codes (0: none). */
  add(columnPos: number, r: DigitRecord, codes: Int32Array) {
    const cube = this.columns[columnPos]!
    const slots = this.slots.of(r)
    cube.whole.add(slots)
    const groupings = cube.groupings
    for (let g = 0; g < groupings.length; g++) {
      const { position, cells } = groupings[g]!
      const code = codes[position]!
      let cell = cells[code]
      if (!cell) {
        // A column that stopped being coded (code 0: too many values) or has too many groups for
        // the memory kept here is dropped: grouping by it counts the records instead.
        if (code === 0 || code > MAX_GROUPS || this.cells >= MAX_CELLS) {
          this.drop(cube, g)
          g--
          continue
        }
        cell = cells[code] = new Cell()
        this.cells++
      }
      cell.add(slots)
    }
  }

  private drop(cube: ColumnCube, index: number) {
    const [dropped] = cube.groupings.splice(index, 1)
    this.cells -= dropped!.cells.filter(Boolean).length
  }

  /** The text columns each number column was counted by; -1 stands for the whole column. */
  groupingsOf(columnPos: number): number[] {
    const cube = this.columns[columnPos]
    return cube ? [-1, ...cube.groupings.map(g => g.position)] : []
  }

  write(out: CopyEncoder, dataset: Buffer) {
    this.columns.forEach((cube, columnPos) => {
      if (!cube) return
      writeCell(out, dataset, columnPos, -1, 0, cube.whole)
      for (const { position, cells } of cube.groupings) {
        cells.forEach((cell, code) => {
          if (cell) writeCell(out, dataset, columnPos, position, code, cell)
        })
      }
    })
  }
}

function writeCell(out: CopyEncoder, dataset: Buffer, columnPos: number, groupPos: number, code: number, cell: Cell) {
  out.row(6)
  out.raw(dataset)
  out.int16(columnPos)
  out.int16(groupPos)
  out.int32(code)
  out.int32Array(cell.counts)
  out.float8Array(cell.arcs())
}

export const CUBE_COLUMNS = ['dataset_id', 'column_pos', 'group_pos', 'group_code', 'counts', 'arcs']

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
