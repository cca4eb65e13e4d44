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

/** What dataset_columns.ladder keeps of a number column's value ladder (server/services/datasets/value-ladder.ts): its bounds as exact decimal text, the coarse ladder's step, and the text columns counted by coarse rung. */
export interface ValueLadder {
  bounds: string[]
  step: number
  pairs: number[]
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
}
