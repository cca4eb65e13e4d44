import { RULES, detectNumberStyle, recordOf, readNumber } from '#shared/digits'
import type { ColumnProfile as SuitabilityProfile, NumberStyle } from '#shared/digits'
import { dayText, detectDateOrder, readDate } from '#shared/dates/read-date'
import type { DateReadingDTO, ValueLadder } from '#shared/types/dataset'
import { ColumnProfile, clip } from './column-profile'
import type { ColumnKind } from './column-profile'
import { CopyEncoder, uuidBytes, writeDigits, writeGroupValue, writeRow } from './copy-encoder'
import { DigitCubeCounter, choosePairs } from './digit-cube'
import { FrequentValues } from './frequent-values'
import type { Leader } from './frequent-values'
import { GroupCodes } from './group-codes'
import { UnreadableFile } from './sniff'
import { chooseBounds } from './value-ladder'

export const MAX_COLUMNS = 2000
const SAMPLE_ROWS = 1000

/** The longest column name a digit-test request can name (digitTestRequestSchema). */
const MAX_NAME = 200

/** Distinct names of at most MAX_NAME characters: "amount", "amount" and "amount (2)" become "amount", "amount (2)", "amount (2) (2)". */
function headerNames(raw: string[]): string[] {
  const taken = new Set<string>()
  return raw.map((cell, i) => {
    const base = cell.replace(/\s+/g, ' ').trim() || `Column ${i + 1}`
    let name = clip(base, MAX_NAME)
    for (let n = 2; taken.has(name); n++) name = `${clip(base, MAX_NAME - ` (${n})`.length)} (${n})`
    taken.add(name)
    return name
  })
}

/** A column is tested as numbers when most of its sampled non-blank cells read as numbers. */
function planColumns(names: string[], sample: string[][]) {
  return names.map((name, position) => {
    const cells = sample.map(row => row[position] ?? '')
    const style: NumberStyle = { decimalMark: detectNumberStyle(cells).decimalMark }
    let filled = 0
    let numbers = 0
    for (const cell of cells) {
      const status = readNumber(cell, style).status
      if (status === 'blank') continue
      filled++
      if (status === 'number' || status === 'zero') numbers++
    }
    const numeric = filled > 0 && numbers >= 0.6 * filled
    return { style, profile: new ColumnProfile(name, numeric, numeric ? style.decimalMark : null) }
  })
}

/**
 * The most frequent value of one sign, for the suitability check's repeated amounts. `count` is
 * exact unless `check` is set: then SQL must count `value` over the stored records.
 */
export interface TopValue {
  value: string
  count: number
  check: boolean
}

/** What the import stores for one column (dataset_columns), besides its most frequent values. */
export interface ColumnSummary {
  name: string
  kind: ColumnKind
  decimalMark: '.' | ',' | null
  parsed: number
  blank: number
  unreadable: number
  zero: number
  negative: number
  min: string | null
  max: string | null
  magnitudeSpan: number | null
  samples: string[]
  coded: boolean
  cubeGroups: number[] | null
  cubePairs: number[] | null
  /** A number column's value ladder (value-ladder.ts); null for text columns and columns of too few values. */
  ladder: ValueLadder | null
  dates: DateReadingDTO | null
  /** Per sign, the suitability facts with topValue still 0, and the most frequent value. */
  signs: { positive: SuitabilityProfile | null, negative: SuitabilityProfile | null, top: { positive: TopValue | null, negative: TopValue | null } } | null
}

export interface EncodedImport {
  rowCount: number
  columns: ColumnSummary[]
  /** Whole COPY streams, signature to trailer, for digit_cube and dataset_group_values. */
  cube: Uint8Array[]
  dictionary: Uint8Array[]
}

/** The held count, when it settles whether the value passes the repeated-amounts rule. */
function topValue(leader: Leader | null, n: number): TopValue | null {
  if (!leader) return null
  // Below the rule even at its largest possible count: the exact count would change nothing.
  const settled = leader.slack === 0 || leader.count + leader.slack < RULES.repeated * n
  return { value: leader.value, count: leader.count, check: !settled }
}

/**
 * Turns a file's rows into the import's COPY bytes (rows and digit records) and, at the end, its
 * column profiles and digit counts. Reads the first SAMPLE_ROWS rows before deciding how each column
 * is read. Knows nothing of threads or the database: row-encoder-thread.ts runs it off the main thread.
 */
export class RowEncoder {
  readonly rows = new CopyEncoder()
  readonly digits = new CopyEncoder()
  private readonly dataset: Buffer
  private readonly header: string[]
  private readonly named: boolean
  private plan: ReturnType<typeof planColumns> | null = null
  private groupCodes: GroupCodes | null = null
  private cube: DigitCubeCounter | null = null
  private frequent: ((readonly [FrequentValues, FrequentValues]) | null)[] = []
  private sample: string[][] = []
  private rowNo = 0

  constructor(datasetId: string, rawHeader: string[]) {
    if (rawHeader.length > MAX_COLUMNS) throw new UnreadableFile(`The header has ${rawHeader.length} columns; Mantissa reads at most ${MAX_COLUMNS}. Remove the columns the story does not need and upload again.`)
    this.dataset = uuidBytes(datasetId)
    this.header = headerNames(rawHeader)
    this.named = rawHeader.some(cell => cell.trim())
  }

  get width(): number {
    return this.header.length
  }

  /** `count` rows in file order, their cells one after another, `width` to a row (JSON records without keys have none). */
  add(cells: readonly string[], count: number) {
    const width = this.width
    for (let row = 0, from = 0; row < count; row++, from += width) {
      if (this.plan) this.write(cells, from)
      else {
        this.sample.push(cells.slice(from, from + width))
        if (this.sample.length === SAMPLE_ROWS) this.startCounting()
      }
    }
  }

  /** The bytes of both tables written since the last take. */
  take(): { rows: Buffer[], digits: Buffer[] } {
    return { rows: this.rows.take(), digits: this.digits.take() }
  }

  /** The last bytes of both tables, then everything learnt about the columns. */
  finish(): { rows: Buffer[], digits: Buffer[], encoded: EncodedImport } {
    if (!this.plan) this.startCounting()
    const plan = this.plan!
    // A header of no names over cells that are all blank (or JSON records without keys) gives nothing to test.
    if (!this.named && plan.every(({ profile }) => profile.blank === this.rowNo)) throw new UnreadableFile('No readable columns: the file has no column names and no values.')
    if (this.rowNo === 0) throw new UnreadableFile('The file has a header but no rows of data.')
    const cube = new CopyEncoder()
    this.cube!.write(cube, this.dataset)
    const dates = plan.map(({ profile }, position) => (profile.kind === 'date' ? this.readDates(position) : null))
    const dictionary = new CopyEncoder()
    for (const [position, code, value] of this.groupCodes!.dictionary()) writeGroupValue(dictionary, this.dataset, position, code, value, dates[position]?.days[code] ?? null)
    return {
      rows: this.rows.end(),
      digits: this.digits.end(),
      encoded: {
        rowCount: this.rowNo,
        columns: plan.map((column, position) => this.summary(column.profile, position, dates[position]?.reading ?? null)),
        cube: cube.end(),
        dictionary: dictionary.end(),
      },
    }
  }

  /** A coded date column's texts read as days, in the one order its values settle. */
  private readDates(position: number): { days: (number | null)[], reading: DateReadingDTO } | null {
    const codes = this.groupCodes!
    if (!codes.isCoded(position)) return null
    const { order, settled } = detectDateOrder([...codes.valuesOf(position)].map(([value]) => value))
    const days: (number | null)[] = []
    let read = 0
    let unread = 0
    let first = Infinity
    let last = -Infinity
    for (const [value, code, rows] of codes.valuesOf(position)) {
      const day = value ? readDate(value, order) : null
      days[code] = day
      if (day === null) {
        if (value) unread += rows
        continue
      }
      read += rows
      first = Math.min(first, day)
      last = Math.max(last, day)
    }
    const timed = codes.timedRows(position)
    return { days, reading: { order, settled, read, unread, first: read ? dayText(first) : null, last: read ? dayText(last) : null, ...(timed === null ? {} : { timed }) } }
  }

  private summary(profile: ColumnProfile, position: number, dates: DateReadingDTO | null): ColumnSummary {
    const signs = this.frequent[position]
    return {
      name: profile.name,
      kind: profile.kind,
      decimalMark: profile.decimalMark,
      parsed: profile.parsed,
      blank: profile.blank,
      unreadable: profile.unreadable,
      zero: profile.zero,
      negative: profile.negative,
      min: profile.min?.text ?? null,
      max: profile.max?.text ?? null,
      magnitudeSpan: profile.magnitudeSpan,
      samples: profile.samples,
      coded: this.groupCodes!.isCoded(position),
      cubeGroups: profile.numeric ? this.cube!.groupingsOf(position) : null,
      cubePairs: profile.numeric ? this.cube!.pairingsOf(position) : null,
      ladder: profile.numeric ? this.cube!.ladderOf(position) : null,
      dates,
      signs: signs
        ? {
            positive: profile.bySign.positive.toProfile(0),
            negative: profile.bySign.negative.toProfile(0),
            top: {
              positive: topValue(signs[0].leader(), profile.bySign.positive.n),
              negative: topValue(signs[1].leader(), profile.bySign.negative.n),
            },
          }
        : null,
    }
  }

  /** Once the sample is read: how each column is read, the text columns' codes, and the digit counts. */
  private startCounting() {
    const plan = planColumns(this.header, this.sample)
    const numbers = plan.flatMap(({ profile }, position) => (profile.numeric ? [position] : []))
    const texts = plan.flatMap(({ profile }, position) => (profile.numeric ? [] : [position]))
    this.plan = plan
    this.groupCodes = new GroupCodes(plan.map(c => !c.profile.numeric), this.sample)
    // Each number column's ladder is cut at its sampled values' quantiles.
    const ladders = plan.map(({ profile, style }, position) => (profile.numeric
      ? chooseBounds(this.sample.flatMap(row => recordOf(readNumber(row[position] ?? '', style)).value ?? []))
      : null))
    this.cube = new DigitCubeCounter(numbers, texts, choosePairs(texts, this.sample), ladders)
    // Per number column, the most frequent positive and negative value (the suitability check's repeated amounts).
    this.frequent = plan.map(({ profile }) => (profile.numeric ? [new FrequentValues(), new FrequentValues()] as const : null))
    const sample = this.sample
    this.sample = []
    for (const row of sample) this.write(row, 0)
  }

  /** The row whose cells start at `from`. */
  private write(cells: readonly string[], from: number) {
    const plan = this.plan!
    const width = plan.length
    const rowNo = ++this.rowNo
    writeRow(this.rows, rowNo, cells, from, width)
    const codes = this.groupCodes!.codesOf(cells, from)
    for (let c = 0; c < width; c++) {
      const column = plan[c]!
      const cell = cells[from + c]!
      if (!column.profile.numeric) {
        column.profile.addText(cell, codes[c])
        continue
      }
      const read = readNumber(cell, column.style)
      const record = recordOf(read)
      column.profile.addNumber(cell, record)
      writeDigits(this.digits, c, rowNo, read, record, codes)
      this.cube!.add(c, record, codes)
      if (record.status === 'number') this.frequent[c]![record.sign > 0 ? 0 : 1].add(record.value!)
    }
  }
}
