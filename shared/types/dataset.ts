export type DatasetStatus = 'importing' | 'ready' | 'failed'
export type ColumnKind = 'amount' | 'count' | 'date' | 'text' | 'identifier'

export interface ColumnDTO {
  name: string
  position: number
  kind: ColumnKind
  /** Whether digit records were stored for it (the column reads mostly as numbers). */
  numeric: boolean
  /** How its numbers were read: the decimal mark (null for text columns). */
  decimalMark: '.' | ',' | null
  parsed: number | null
  blank: number
  unreadable: number | null
  zero: number | null
  negative: number | null
  min: string | null
  max: string | null
  magnitudeSpan: number | null
  samples: string[]
  /** A text column whose values the digit records carry as codes, so grouping by it is fast. */
  coded: boolean
  /** A date column: how its dates were read (null for other columns, and for a date column too varied to code). */
  dates: DateReadingDTO | null
}

/** What dataset_columns.ladder keeps of a number column's value ladder (server/services/datasets/value-ladder.ts): its bounds as exact decimal text. */
export interface ValueLadder {
  bounds: string[]
}

/** How an import read a date column: in which order all-numeric dates were taken, and how many rows gave a date. */
export interface DateReadingDTO {
  order: 'ymd' | 'dmy' | 'mdy'
  /** False when no value told day from month (every part 12 or under): then read day first. */
  settled: boolean
  /** Rows whose cell reads as a date, and non-blank rows whose cell does not. */
  read: number
  unread: number
  /** A column of timestamps: the rows whose time of day was set aside, each read as the day written (no offset applied). */
  timed?: number
  first: string | null
  last: string | null
}

export interface DatasetSummaryDTO {
  id: string
  title: string
  status: DatasetStatus
  progress: number
  error: string | null
  rowCount: number | null
  byteSize: number
  originalName: string
  createdAt: string
  createdBy: string
  archived: boolean
  obtainedOn: string | null
  sha256: string
  /** The workbook sheet read, when not the first visible one. */
  sheet: string | null
  /** Readings of one upload share their group (the first reading's id) and are numbered from 1. */
  readingGroup: string
  readingNo: number
}

export interface DatasetDTO extends DatasetSummaryDTO {
  newsroomId: string
  /** The uploader's user id (createdBy is their name). */
  createdById: string
  sourceNote: string | null
  sourceUrl: string | null
  format: string
  /** How the file was compressed ("gzip" or "zip"), or null. */
  compression: string | null
  /** The table read from a zip archive. */
  archiveEntry: string | null
  /** The sheets the workbook lists (the one read is `sheet`). */
  sheets: string[] | null
  encoding: string | null
  delimiter: string | null
  raggedRows: number
  replacesId: string | null
  columns: ColumnDTO[]
  /** How this version was told to read its columns (empty for the upload's first reading). */
  columnReadings: ColumnReadings
  /** Every reading of the same upload, this one included, first to last. */
  readings: ReadingDTO[]
}

/**
 * How a reporter told one column to be read, after its import; an unset field is read as detected.
 * `kind` amount, count or identifier reads the column as numbers, date or text as text.
 */
export interface ColumnReading {
  kind?: ColumnKind
  decimalMark?: '.' | ','
  negatives?: 'leading-minus' | 'trailing-minus' | 'parentheses'
  /** A currency mark to strip besides those always read, such as "KSh". */
  currency?: string
  dateOrder?: 'ymd' | 'dmy' | 'mdy'
}

/** The column readings of a dataset, by column name. */
export type ColumnReadings = Record<string, ColumnReading>

/** One reading of an upload: the same stored bytes, its columns read as `readings` say. */
export interface ReadingDTO {
  id: string
  readingNo: number
  status: DatasetStatus
  archived: boolean
  createdAt: string
  createdBy: string
  readings: ColumnReadings
}

export interface PageDTO<T> {
  page: number
  pageSize: number
  total: number
  items: T[]
}

export interface RowDTO {
  rowNo: number
  cells: string[]
  /** A ragged row (the rows page only): how many cells the file gave it, and those past the header. */
  cellCount?: number
  extra?: string[]
}

/** One listed cell: its row number and the text the file had there. */
export interface CellDTO {
  rowNo: number
  text: string
}

/** A row with another number of cells than the header, and the cells past the header. */
export interface RaggedRowDTO {
  rowNo: number
  cellCount: number
  extra: string[]
}
