export type DatasetStatus = 'importing' | 'ready' | 'failed'
export type ColumnKind = 'amount' | 'count' | 'date' | 'text' | 'identifier'

export interface ColumnDTO {
  name: string
  position: number
  kind: ColumnKind
  /** Whether digit records were stored for it (the column reads mostly as numbers). */
  numeric: boolean
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
}

export interface DatasetDTO extends DatasetSummaryDTO {
  newsroomId: string
  sourceNote: string | null
  sourceUrl: string | null
  obtainedOn: string | null
  sha256: string
  format: string
  /** How the file was compressed ("gzip" or "zip"), or null. */
  compression: string | null
  /** The table read from a zip archive. */
  archiveEntry: string | null
  /** The workbook sheet that was read (null: the first visible one) and the sheets the workbook lists. */
  sheet: string | null
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
