import { LRUCache } from 'lru-cache'
import { Readable } from 'node:stream'
import { toCsv } from '#shared/export/csv'
import type { CellListQuery, RangedTest } from '#shared/schemas/dataset'
import type { CellDTO, ColumnDTO, PageDTO, RaggedRowDTO } from '#shared/types/dataset'
import type { Dataset } from '../../models'
import { datasetColumns } from './catalog'
import { numbersOfSign, STATUS_CODES } from './digit-columns'
import { columnByName, rawSelect } from './digit-query'
import { dictionaryOf } from './dictionary'
import { codedText } from './group-codes'

export const RAGGED_PAGE_SIZE = 50
/** Rows a query of the CSV download reads at a time: the download never holds a whole column. */
const CSV_BATCH = 5000
/** Rows a query reads at a time while finding a date column's unreadable texts. */
const TEXT_WINDOW = 50_000

/** The records a ranged test leaves out as under its minimum (OUTSIDE_RANGE_RULES in shared/charts/labels.ts). */
const OUTSIDE: Record<RangedTest, string> = {
  'first-two-digits': 'd.first_two IS NULL',
  'summation': 'd.first_two IS NULL',
  'first-three-digits': 'd.first_three IS NULL',
  'last-two-digits': 'd.last_two IS NULL',
  'round-numbers': 'd.integer_digits < 2',
}

interface CellPick {
  /** Row numbers of the cells, with `d` the digit records and `r` the rows: FROM … WHERE … */
  from: string
  /** What the column's profile already counted, or null when SQL must count. */
  total: number | null
  /** Values the `from` names besides the dataset. */
  values?: Record<string, unknown>
}

function readyOrConflict(dataset: Dataset) {
  if (dataset.status !== 'ready') throw fail(409, { message: 'This dataset is not ready yet: wait for its import to finish.' })
}

/** A dataset never changes once ready, so the texts its date columns could not read are found once per server (as many texts as a dictionary holds). */
const unreadTextsKept = new LRUCache<string, string[]>({ maxSize: 1_000_000, sizeCalculation: texts => Math.max(1, texts.length) })

/**
 * The texts, as the file wrote them, of a date column's cells that its import read as no date. The
 * import coded each cell by its trimmed text, or a timestamp by its day (codedText), and kept whether
 * that text names a day (the column's dictionary): every distinct text of the column is coded again
 * here, a window of rows at a time, and kept when its code named none.
 */
async function unreadDateTexts(dataset: Dataset, column: ColumnDTO): Promise<string[]> {
  const key = `${dataset.id}:${column.position}`
  const hit = unreadTextsKept.get(key)
  if (hit) return hit
  const texts = await findUnreadDateTexts(dataset, column)
  unreadTextsKept.set(key, texts)
  return texts
}

async function findUnreadDateTexts(dataset: Dataset, column: ColumnDTO): Promise<string[]> {
  const datasetId = dataset.id
  const { codeOf, dayOf } = await dictionaryOf(datasetId, column.position)
  const unread = new Set([...codeOf].flatMap(([value, code]) => (value && dayOf.get(code) === null ? [value] : [])))
  const texts = new Set<string>()
  if (!unread.size) return []
  const timed = column.dates?.timed !== undefined
  for (let from = 0; from < (dataset.rowCount ?? 0); from += TEXT_WINDOW) {
    const window = await rawSelect<{ text: string }>(`SELECT DISTINCT r.cells[${column.position + 1}] AS text FROM dataset_rows r
      WHERE r.dataset_id = :datasetId AND r.row_no > :from AND r.row_no <= :to`, { datasetId, from, to: from + TEXT_WINDOW })
    for (const { text } of window) if (text !== null && unread.has(codedText(text, timed))) texts.add(text)
  }
  return [...texts]
}

/** A date column's unreadable cells: those whose text is one the import read as no date. */
async function unreadDates(dataset: Dataset, column: ColumnDTO): Promise<CellPick> {
  if (!column.dates) {
    throw fail(400, [{ path: 'status', message: `"${column.name}" was not read as days (nearly every value differs, or there are too many to code): none of its cells was counted unreadable.` }])
  }
  const texts = await unreadDateTexts(dataset, column)
  const rows = `dataset_rows d WHERE d.dataset_id = :datasetId AND `
  if (!texts.length) return { from: `${rows}false`, total: 0 }
  return { from: `${rows}d.cells[${column.position + 1}] IN (:texts)`, total: null, values: { texts } }
}

/** Where the asked cells of one column are, and how many, from the digit records (number columns) or the rows (text). */
async function pick(dataset: Dataset, column: ColumnDTO, query: CellListQuery): Promise<CellPick> {
  const records = (condition: string) => `digit_records d WHERE d.dataset_id = :datasetId AND d.column_pos = ${column.position} AND ${condition}`
  if (!column.numeric) {
    if (query.status === 'unreadable' && column.kind === 'date') return unreadDates(dataset, column)
    if (query.status !== 'blank') {
      const which = column.kind === 'date' ? 'its blank cells and those that name no date' : 'its blank cells'
      throw fail(400, [{ path: 'status', message: `"${column.name}" is read as ${column.kind === 'date' ? 'dates' : 'text'}: only ${which} can be listed.` }])
    }
    // A cell of spaces is blank, as the import counted it (ColumnProfile.addText trims).
    return { from: `dataset_rows d WHERE d.dataset_id = :datasetId AND d.cells[${column.position + 1}] ~ '^\\s*$'`, total: column.blank }
  }
  switch (query.status) {
    case 'blank': return { from: records(`d.status = ${STATUS_CODES.blank}`), total: column.blank }
    case 'unreadable': return { from: records(`d.status = ${STATUS_CODES.unreadable}`), total: column.unreadable }
    case 'zero': return { from: records(`d.status = ${STATUS_CODES.zero}`), total: column.zero }
    case 'negative': return { from: records(numbersOfSign('negative')), total: column.negative }
    case 'outside': return { from: records(`${numbersOfSign(query.sign)} AND ${OUTSIDE[query.test!]}`), total: null }
  }
}

async function located(dataset: Dataset, query: CellListQuery) {
  readyOrConflict(dataset)
  const column = columnByName(await datasetColumns(dataset.id), query.column, 'column')
  return { column, picked: await pick(dataset, column, query) }
}

/** One page of the asked cells: row numbers and the raw text the file had. */
async function cellsAfter(dataset: Dataset, column: ColumnDTO, picked: CellPick, page: { offset: number, limit: number, afterRow?: number }): Promise<CellDTO[]> {
  const after = page.afterRow === undefined ? '' : ' AND d.row_no > :afterRow'
  return rawSelect<CellDTO>(`SELECT r.row_no AS "rowNo", r.cells[${column.position + 1}] AS text
    FROM (SELECT d.row_no FROM ${picked.from}${after} ORDER BY d.row_no LIMIT :limit OFFSET :offset) hit
    JOIN dataset_rows r ON r.dataset_id = :datasetId AND r.row_no = hit.row_no ORDER BY r.row_no`,
  { datasetId: dataset.id, ...picked.values, ...page })
}

/** A page of one column's cells of one status (or outside one test's range), with their row numbers and raw text. */
export async function listCells(dataset: Dataset, query: CellListQuery): Promise<PageDTO<CellDTO> & { column: string, status: string }> {
  const { column, picked } = await located(dataset, query)
  const [items, total] = await Promise.all([
    cellsAfter(dataset, column, picked, { offset: (query.page - 1) * query.pageSize, limit: query.pageSize }),
    picked.total ?? rawSelect<{ total: number }>(`SELECT count(*)::int AS total FROM ${picked.from}`, { datasetId: dataset.id, ...picked.values }).then(rows => rows[0]?.total ?? 0),
  ])
  return { page: query.page, pageSize: query.pageSize, total, items, column: column.name, status: query.status }
}

/**
 * Every asked cell of the column as CSV (row, cell as in the file), read a batch at a time by row
 * number, so that a column of millions is never held. Text that a spreadsheet could run as a
 * formula is written inert (toCsv).
 */
export async function cellsCsv(dataset: Dataset, query: CellListQuery): Promise<{ fileName: string, body: Readable }> {
  const { column, picked } = await located(dataset, query)
  async function* lines() {
    yield toCsv([['row', column.name]])
    let afterRow = 0
    for (;;) {
      const batch = await cellsAfter(dataset, column, picked, { offset: 0, limit: CSV_BATCH, afterRow })
      if (!batch.length) return
      yield toCsv(batch.map(cell => [cell.rowNo, cell.text]))
      afterRow = batch.at(-1)!.rowNo
    }
  }
  const which = query.status === 'outside' ? `outside-${query.test}` : query.status
  const fileName = `${dataset.title}-${column.name}-${which}.csv`.replace(/[^\p{L}\p{N}._-]+/gu, '-')
  return { fileName, body: Readable.from(lines()) }
}

/** The rows that had another number of cells than the header, a page at a time, with the cells past it. */
export async function listRaggedRows(dataset: Dataset, page: number): Promise<PageDTO<RaggedRowDTO> & { width: number }> {
  readyOrConflict(dataset)
  const width = (await datasetColumns(dataset.id)).length
  const [items, total] = await Promise.all([
    rawSelect<RaggedRowDTO>(`SELECT r.row_no AS "rowNo", r.cell_count AS "cellCount", coalesce(r.extra_cells, '{}') AS extra
      FROM dataset_rows r WHERE r.dataset_id = :datasetId AND r.cell_count IS NOT NULL ORDER BY r.row_no LIMIT :limit OFFSET :offset`,
    { datasetId: dataset.id, limit: RAGGED_PAGE_SIZE, offset: (page - 1) * RAGGED_PAGE_SIZE }),
    rawSelect<{ total: number }>(`SELECT count(*)::int AS total FROM dataset_rows r WHERE r.dataset_id = :datasetId AND r.cell_count IS NOT NULL`, { datasetId: dataset.id })
      .then(rows => rows[0]?.total ?? 0),
  ])
  return { page, pageSize: RAGGED_PAGE_SIZE, total, items, width }
}
