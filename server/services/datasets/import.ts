import { buffer } from 'node:stream/consumers'
import type { Readable } from 'node:stream'
import type { PoolClient } from 'pg'
import { QueryTypes } from 'sequelize'
import type { ColumnProfile as SuitabilityProfile } from '#shared/digits'
import type { Dataset } from '../../models'
import { CopyStream } from './bulk-copy'
import { DIGIT_COLUMNS, GROUP_VALUE_COLUMNS, ROW_COLUMNS } from './copy-encoder'
import type { RaggedRow } from './copy-encoder'
import { signCode, STATUS_CODES } from './digit-columns'
import { CUBE_COLUMNS } from './digit-cube'
import { inflatedHead, inflatedOpener } from './compressed'
import { openRows } from './readers'
import type { EncodedImport, TopValue } from './row-encoder'
import { RowEncoderWorker } from './row-encoder-worker'
import type { Encoded } from './row-encoder-worker'
import { UnreadableFile, detectEncoding, detectFileEncoding } from './sniff'
import type { DatasetFormat, TextEncoding } from './sniff'
import { readAhead } from './column-scan'
import { dropPartitionsSql, partitionNames } from './partitions'
import { duplicateCounts } from './digit-tests'
import { countCodeRepeats } from './code-repeats'

const PROGRESS_EVERY_MS = 500
/** Batches of rows with the encoding thread at once: enough to keep it busy, few enough to bound memory. */
const BATCHES_AHEAD = 4

interface Connections {
  rows: PoolClient
  digits: PoolClient
}

/**
 * Two connections for an import's two COPYs. After a failure they are closed, not pooled: a COPY
 * cut off half-way can leave a connection in the middle of the protocol, and the next query sent
 * on it made PostgreSQL log "protocol synchronization was lost".
 */
async function withConnections<T>(work: (c: Connections) => Promise<T>): Promise<T> {
  const manager = useDb().sequelize.connectionManager
  const rows = await manager.getConnection({ type: 'write' }) as PoolClient
  let digits: PoolClient
  try {
    digits = await manager.getConnection({ type: 'write' }) as PoolClient
  }
  catch (error) {
    manager.releaseConnection(rows)
    throw error
  }
  let clean = false
  try {
    const result = await work({ rows, digits })
    clean = true
    return result
  }
  finally {
    for (const connection of [rows, digits]) {
      if (clean) manager.releaseConnection(connection)
      else await manager.destroyConnection(connection).catch(() => {})
    }
  }
}

/** Drops an import's standalone tables: nothing of a failed import stays behind. */
async function dropStaging(client: PoolClient, datasetId: string) {
  // A COPY that failed half-way leaves its transaction open: end it before the connection goes back.
  await client.query('ROLLBACK').catch(() => {})
  await client.query(dropPartitionsSql(datasetId)).catch(() => {})
}

/** What every step of one import needs: the dataset, its stored file and its tables' names. */
interface ImportJob {
  datasetId: string
  dataset: Dataset
  names: ReturnType<typeof partitionNames>
  /** The stored bytes as uploaded, from `start` (to `end`, inclusive). */
  openRaw: (start: number, end?: number) => Promise<Readable>
  /** The table's bytes: inflated from the start when the upload was compressed, else the stored ones. */
  openStored: (start?: number) => Promise<Readable>
}

interface CopiedRows {
  source: ReturnType<typeof openRows>
  encoding: TextEncoding
  ragged: number
  encoded: EncodedImport
}

// The CHECK constraints, made while the tables are empty, let ATTACH PARTITION skip its scan.
const onlyThis = (table: string, datasetId: string) => `ALTER TABLE ${table} ADD CONSTRAINT ${table}_one CHECK (dataset_id = '${datasetId}');`
// Rows and digit records arrive without their dataset (copy-encoder.ts).
const byDefault = (table: string, datasetId: string) => `${onlyThis(table, datasetId)} ALTER TABLE ${table} ALTER COLUMN dataset_id SET DEFAULT '${datasetId}';`

/**
 * Reads a stored upload into standalone tables, then attaches them as the dataset's partitions
 * in one transaction with its columns and its "ready" status: a reader sees all of it or nothing.
 * This thread reads and parses the file and talks to PostgreSQL; a worker thread works out the
 * digits and writes the COPY bytes (row-encoder.ts).
 * Throws UnreadableFile with a reporter-facing reason when the file cannot be used.
 */
export async function importDataset(datasetId: string): Promise<void> {
  const dataset = await useDb().models.Dataset.findByPk(datasetId)
  if (!dataset || dataset.status !== 'importing') return
  const files = useFileStore()
  const openRaw = (start: number, end?: number) => files.open(dataset.storageKey, start, end)
  // A compressed table is read inflating, from its start; anything else straight from the store.
  const openStored = dataset.compression
    ? inflatedOpener(openRaw, Number(dataset.byteSize), dataset.compression, dataset.archiveEntry, Number(useRuntimeConfig().uploadLimitBytes))
    : (start = 0) => openRaw(start)
  const job: ImportJob = { datasetId, dataset, names: partitionNames(datasetId), openRaw, openStored }

  // The encoding thread starts, the file's encoding is found and the tables are made side by side.
  const encoder = new RowEncoderWorker(datasetId, dataset.columnReadings)
  const detected = detectFormatEncoding(job)
  detected.catch(() => {}) // awaited below; a failure before then must not go unhandled
  try {
    await withConnections(async (db) => {
      const open: CopyStream[] = []
      let columns: EncodedImport['columns']
      try {
        await db.rows.query(dropPartitionsSql(datasetId))
        open.push(...await openCopies(job, db))
        const read = await streamRows(job, encoder, open as [CopyStream, CopyStream], await detected)
        open.length = 0 // both COPYs have ended and committed their tables
        await encoder.stop()
        await attach(job, db, read)
        columns = read.encoded.columns
      }
      catch (error) {
        // The one clean-up of a failed import: end the COPYs still open, stop the thread, drop the tables.
        await Promise.all([...open.map(copy => copy.abort()), encoder.stop()])
        await dropStaging(db.rows, datasetId)
        throw error
      }
      await speedUp(job, db)
      void readAhead(datasetId, dataset.rowCount ?? 0).catch(error => console.warn(`[column scan] ${datasetId} not read ahead: ${(error as Error).message}`))
      await countRepeats(job, columns)
    })
  }
  finally {
    await encoder.stop()
  }
}

async function detectFormatEncoding({ dataset, openRaw, openStored }: ImportJob) {
  const head = dataset.compression ? await inflatedHead(await openStored()) : await buffer(await openRaw(0, 64 * 1024 - 1))
  return dataset.format === 'xlsx' ? detectEncoding(head) : await detectFileEncoding(openStored, head)
}

/** Starts the COPYs of rows and digit records into new standalone tables, each on its connection. */
async function openCopies({ datasetId, names }: ImportJob, db: Connections): Promise<[CopyStream, CopyStream]> {
  const opened = await Promise.allSettled([
    CopyStream.open(db.rows, names.rows, 'dataset_rows', ROW_COLUMNS, byDefault(names.rows, datasetId)),
    CopyStream.open(db.digits, names.digits, 'digit_records', DIGIT_COLUMNS, byDefault(names.digits, datasetId)),
  ])
  const refused = opened.find(result => result.status === 'rejected')
  if (refused) {
    // One COPY may have started: end it before its connection goes back to the pool.
    await Promise.all(opened.map(result => (result.status === 'fulfilled' ? result.value.abort() : null)))
    throw refused.reason
  }
  return opened.map(result => (result as PromiseFulfilledResult<CopyStream>).value) as [CopyStream, CopyStream]
}

/** Streams the file's rows through the encoding thread into both COPYs; returns what was learnt. */
async function streamRows(
  { datasetId, dataset, openRaw, openStored }: ImportJob, encoder: RowEncoderWorker, [rowsOut, digitsOut]: [CopyStream, CopyStream],
  { encoding, bomLength }: { encoding: TextEncoding, bomLength: number },
): Promise<CopiedRows> {
  const stored = { open: dataset.format === 'xlsx' ? openRaw : openStored, byteSize: Number(dataset.byteSize), sheet: dataset.sheet }
  const source = openRows(dataset.format as DatasetFormat, stored, encoding, bomLength)
  let width = -1
  let ragged = 0
  let lastProgress = Date.now()
  const ahead: Promise<Encoded>[] = []
  const send = async ({ rows, digits }: Encoded) => {
    await Promise.all([rowsOut.send(rows), digitsOut.send(digits)])
    if (Date.now() - lastProgress > PROGRESS_EVERY_MS) {
      lastProgress = Date.now()
      await useDb().models.Dataset.update({ progress: Math.min(0.99, source.bytesRead() / Number(dataset.byteSize)) }, { where: { id: datasetId } })
    }
  }
  for await (const batch of source.rows) {
    let from = 0
    if (width < 0) {
      width = batch[0]!.length
      encoder.header(batch[0]!)
      from = 1
    }
    // The cells one after another, each row cut or padded to the header's width; a ragged row's
    // cell count and the cells past the header go beside them, so nothing of the file is lost.
    const cells: string[] = []
    const raggedRows: [number, RaggedRow][] = []
    for (let i = from; i < batch.length; i++) {
      const raw = batch[i]!
      if (raw.length !== width) {
        ragged++
        raggedRows.push([i - from, { cellCount: raw.length, extra: raw.slice(width) }])
      }
      for (let c = 0; c < width; c++) cells.push(raw[c] ?? '')
    }
    if (from === batch.length) continue
    const encoding = encoder.encode(cells, batch.length - from, raggedRows)
    // Awaited in order below; one that fails before its turn (the thread refused the header) must not go unhandled.
    encoding.catch(() => {})
    ahead.push(encoding)
    if (ahead.length >= BATCHES_AHEAD) await send(await ahead.shift()!)
  }
  if (width < 0) throw new UnreadableFile('No readable columns: the file holds no rows at all.')
  for (const next of ahead.splice(0)) await send(await next)
  const last = await encoder.finish()
  await rowsOut.end(last.rows)
  await digitsOut.end(last.digits)
  return { source, encoding, ragged, encoded: last.encoded }
}

/**
 * The indexes and planner statistics follow once the dataset is ready: they make queries fast
 * and change no answer, and a reporter need not wait the second per million rows they take. Preview
 * pages and joins find rows by number; drill-down walks a column's records in row order. Rows
 * are only ever found by number, so statistics on their cells would tell the planner nothing. A range
 * filter counts the records of the rungs it cuts through by value (value-ladder.ts), and a question
 * reads the cube's cells of one column and one cut of it (thousands of cells with the value ladder's).
 * Should this fail, queries stay right, only slower, and autovacuum still gathers statistics.
 * One connection does it all, leaving the other core to the reporter's first questions.
 */
async function speedUp({ datasetId, names, dataset }: ImportJob, db: Connections) {
  await db.rows.query(`
    CREATE INDEX IF NOT EXISTS ${names.rows}_row_no ON ${names.rows} (row_no);
    ${dataset.raggedRows ? `CREATE INDEX IF NOT EXISTS ${names.rows}_ragged ON ${names.rows} (row_no) WHERE cell_count IS NOT NULL;` : ''}
    CREATE INDEX IF NOT EXISTS ${names.digits}_column_row ON ${names.digits} (column_pos, row_no);
    CREATE INDEX IF NOT EXISTS ${names.digits}_column_value ON ${names.digits} (column_pos, value);
    CREATE INDEX IF NOT EXISTS ${names.cube}_cells ON ${names.cube} (column_pos, group_pos, pair_pos);
    ANALYZE ${names.rows} (row_no); ANALYZE ${names.digits}; ANALYZE ${names.cube};
  `).catch(error => console.warn(`[import] ${datasetId}: indexes or statistics not made: ${(error as Error).message}`))
}

/**
 * Each number column's repeated values per sign, counted once over the whole column and per value of
 * each text column the cube counts it by, and kept, so that the repeated-amounts test, unfiltered or
 * filtered to one value, reads them (until then it counts them itself, with the same answer). A
 * failure here changes no answer either.
 */
async function countRepeats({ datasetId, names }: ImportJob, columns: EncodedImport['columns']) {
  for (const [position, column] of columns.entries()) {
    if (!column.signs) continue
    const whole = { from: `${names.digits} d`, where: `d.column_pos = ${position}`, replacements: { datasetId } }
    try {
      // By each text column the cube counts it by (one department's repeated amounts read them), then
      // the whole column's, last, so that a column with its repeats kept has all of them.
      for (const textPos of column.cubeGroups ?? []) if (textPos >= 0) await countCodeRepeats(datasetId, names.digits, position, textPos)
      const [positive, negative] = [await duplicateCounts(whole, 'positive'), await duplicateCounts(whole, 'negative')]
      await useDb().models.DatasetColumn.update({ repeats: { positive, negative } }, { where: { datasetId, position } })
    }
    catch (error) {
      console.warn(`[import] ${datasetId}: repeated values of column ${position} not kept: ${(error as Error).message}`)
    }
  }
}

/** How often each column's most frequent value (per sign) occurs, where the import could not settle it (row-encoder.ts). */
async function topCounts({ names }: ImportJob, columns: EncodedImport['columns']) {
  const replacements: Record<string, unknown> = {}
  const candidates = columns.flatMap((column, position) => (['positive', 'negative'] as const).flatMap((sign) => {
    const top = column.signs?.top[sign]
    if (!top?.check) return []
    const i = Object.keys(replacements).length
    replacements[`v${i}`] = top.value
    return [`(${position}::smallint, ${signCode(sign)}::smallint, CAST(:v${i} AS numeric))`]
  }))
  if (!candidates.length) return []
  return useDb().sequelize.query<{ column_pos: number, sign: number, top: number }>(
    `SELECT column_pos, sign, count(*)::int AS top FROM ${names.digits}
     WHERE status = ${STATUS_CODES.number} AND (column_pos, sign, value) IN (VALUES ${candidates.join(', ')}) GROUP BY 1, 2`,
    { replacements, type: QueryTypes.SELECT },
  )
}

/** Writes the counts and the dictionary, then attaches the tables and marks the dataset ready, in one transaction. */
async function attach(job: ImportJob, db: Connections, { encoded, ragged, source, encoding }: CopiedRows) {
  const { datasetId, names, dataset: ready } = job
  const { sequelize, models } = useDb()
  const meta = source.meta
  // Side by side on the import's connection and one from the pool: the digit counts and the
  // dictionary, and exact counts of repeated values.
  const [counted] = await Promise.all([
    topCounts(job, encoded.columns),
    (async () => {
      const counts = await CopyStream.open(db.rows, names.cube, 'digit_cube', CUBE_COLUMNS, onlyThis(names.cube, datasetId))
      await counts.end(encoded.cube)
      const dictionary = await CopyStream.open(db.rows, names.groupValues, 'dataset_group_values', GROUP_VALUE_COLUMNS)
      await dictionary.end(encoded.dictionary)
    })(),
  ])
  const withTop = (profile: SuitabilityProfile | null, top: TopValue | null, position: number, sign: number) => {
    if (!profile) return null
    const exact = top?.check ? counted.find(r => r.column_pos === position && r.sign === sign)?.top : top?.count
    return { ...profile, topValue: exact ?? 0 }
  }

  await sequelize.transaction(async (transaction) => {
    await sequelize.query(`
      ALTER TABLE dataset_rows ATTACH PARTITION ${names.rows} FOR VALUES IN ('${datasetId}');
      ALTER TABLE digit_records ATTACH PARTITION ${names.digits} FOR VALUES IN ('${datasetId}');
      ALTER TABLE digit_cube ATTACH PARTITION ${names.cube} FOR VALUES IN ('${datasetId}');
      INSERT INTO dataset_group_values SELECT * FROM ${names.groupValues};
      DROP TABLE ${names.groupValues};
    `, { transaction })
    await models.DatasetColumn.bulkCreate(encoded.columns.map(({ signs, ...column }, position) => ({
      datasetId,
      position,
      ...column,
      profiles: signs
        ? { positive: withTop(signs.positive, signs.top.positive, position, 1), negative: withTop(signs.negative, signs.top.negative, position, -1) }
        : null,
    })), { transaction })
    await ready.update({
      status: 'ready', progress: 1, rowCount: encoded.rowCount, raggedRows: ragged,
      encoding, delimiter: meta.delimiter, sheets: meta.sheets, readyAt: new Date(),
    }, { transaction })
    await recordAudit({
      newsroomId: ready.newsroomId, actorId: ready.createdBy, action: 'dataset.imported',
      subjectType: 'dataset', subjectId: datasetId,
      detail: { title: ready.title, sha256: ready.sha256, rows: encoded.rowCount, columns: encoded.columns.length, ragged },
    }, transaction)
  })
}
