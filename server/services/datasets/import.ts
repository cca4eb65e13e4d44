import { buffer } from 'node:stream/consumers'
import type { PoolClient } from 'pg'
import { QueryTypes } from 'sequelize'
import { detectNumberStyle, recordOf, readNumber } from '#shared/digits'
import type { NumberStyle } from '#shared/digits'
import { ColumnProfile, clip } from './column-profile'
import { CopyWriter, DIGIT_COLUMNS, GROUP_VALUE_COLUMNS, ROW_COLUMNS, uuidBytes, writeDigits, writeGroupValue, writeRow } from './bulk-copy'
import { CUBE_COLUMNS, DigitCubeCounter } from './digit-cube'
import { FrequentValues } from './frequent-values'
import { GroupCodes } from './group-codes'
import { openRows } from './readers'
import { UnreadableFile, detectEncoding, detectFileEncoding } from './sniff'
import type { DatasetFormat } from './sniff'
import { dropPartitionsSql, partitionNames } from './partitions'

export const MAX_COLUMNS = 2000
const SAMPLE_ROWS = 1000
const PROGRESS_EVERY_MS = 500

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

interface Connections {
  rows: PoolClient
  digits: PoolClient
}

async function withConnections<T>(work: (c: Connections) => Promise<T>): Promise<T> {
  const manager = useDb().sequelize.connectionManager
  const rows = await manager.getConnection({ type: 'write' }) as PoolClient
  const digits = await manager.getConnection({ type: 'write' }) as PoolClient
  try {
    return await work({ rows, digits })
  }
  finally {
    manager.releaseConnection(rows)
    manager.releaseConnection(digits)
  }
}

/** Drops an import's standalone tables: nothing of a failed import stays behind. */
async function dropStaging(client: PoolClient, datasetId: string) {
  // A COPY that failed half-way leaves its transaction open: end it before the connection goes back.
  await client.query('ROLLBACK').catch(() => {})
  await client.query(dropPartitionsSql(datasetId)).catch(() => {})
}

/** Once the sample is read: how each column is read, the text columns' codes, and the digit counts. */
function startCounting(header: string[], sample: string[][]) {
  const plan = planColumns(header, sample)
  const numbers = plan.flatMap(({ profile }, position) => (profile.numeric ? [position] : []))
  const texts = plan.flatMap(({ profile }, position) => (profile.numeric ? [] : [position]))
  // Per number column, the most frequent positive and negative value (the suitability check's repeated amounts).
  const frequent = plan.map(({ profile }) => (profile.numeric ? [new FrequentValues(), new FrequentValues()] as const : null))
  return { plan, groupCodes: new GroupCodes(plan.map(c => !c.profile.numeric), sample), cube: new DigitCubeCounter(numbers, texts), frequent }
}

/**
 * Reads a stored upload into standalone tables, then attaches them as the dataset's partitions
 * in one transaction with its columns and its "ready" status: a reader sees all of it or nothing.
 * Throws UnreadableFile with a reporter-facing reason when the file cannot be used.
 */
export async function importDataset(datasetId: string): Promise<void> {
  const { sequelize, models } = useDb()
  const dataset = await models.Dataset.findByPk(datasetId)
  if (!dataset || dataset.status !== 'importing') return
  const files = useFileStore()
  const openStored = (start = 0) => files.open(dataset.storageKey, start)
  const head = await buffer(await files.open(dataset.storageKey, 0, 64 * 1024 - 1))
  const { encoding, bomLength } = dataset.format === 'xlsx'
    ? detectEncoding(head)
    : await detectFileEncoding(openStored, head)
  const names = partitionNames(datasetId)
  // The CHECK constraints, made while the tables are empty, let ATTACH PARTITION skip its scan.
  const onlyThis = `CHECK (dataset_id = '${datasetId}')`

  await withConnections(async (db) => {
    await db.rows.query(dropPartitionsSql(datasetId))
    const datasetBytes = uuidBytes(datasetId)
    const rowsOut = await CopyWriter.open(db.rows, names.rows, 'dataset_rows', ROW_COLUMNS, onlyThis)
    const digitsOut = await CopyWriter.open(db.digits, names.digits, 'digit_records', DIGIT_COLUMNS, onlyThis)
    const source = openRows(dataset.format as DatasetFormat, openStored, encoding, bomLength)
    let header: string[] | null = null
    let named = false
    let plan: ReturnType<typeof planColumns> | null = null
    let groupCodes: GroupCodes | null = null
    let cube: DigitCubeCounter | null = null
    let frequent: ReturnType<typeof startCounting>['frequent'] = []
    const sample: string[][] = []
    let rowNo = 0
    let ragged = 0
    let lastProgress = Date.now()

    // Synchronous per row; the writers are flushed once per batch of rows.
    const write = (raw: string[]) => {
      const width = header!.length
      if (raw.length !== width) ragged++
      const cells = raw.length === width ? raw : Array.from({ length: width }, (_, i) => raw[i] ?? '')
      rowNo++
      writeRow(rowsOut, datasetBytes, rowNo, cells)
      const codes = groupCodes!.codesOf(cells)
      for (let c = 0; c < width; c++) {
        const column = plan![c]!
        const cell = cells[c]!
        if (!column.profile.numeric) {
          column.profile.addText(cell)
          continue
        }
        const read = readNumber(cell, column.style)
        const record = recordOf(read)
        column.profile.addNumber(cell, record)
        writeDigits(digitsOut, datasetBytes, c, rowNo, read, record, codes)
        cube!.add(c, record, codes)
        if (record.status === 'number') frequent[c]![record.sign > 0 ? 0 : 1].add(record.value!)
      }
    }
    const afterBatch = async () => {
      await Promise.all([rowsOut.flush(), digitsOut.flush()])
      if (Date.now() - lastProgress > PROGRESS_EVERY_MS) {
        lastProgress = Date.now()
        await models.Dataset.update({ progress: Math.min(0.99, source.bytesRead() / Number(dataset.byteSize)) }, { where: { id: datasetId } })
      }
    }

    try {
      for await (const batch of source.rows) {
        for (const raw of batch) {
          if (!header) {
            if (raw.length > MAX_COLUMNS) throw new UnreadableFile(`The header has ${raw.length} columns; Mantissa reads at most ${MAX_COLUMNS}. Remove the columns the story does not need and upload again.`)
            header = headerNames(raw)
            named = raw.some(cell => cell.trim())
            continue
          }
          if (!plan) {
            sample.push(raw)
            if (sample.length < SAMPLE_ROWS) continue
            ;({ plan, groupCodes, cube, frequent } = startCounting(header, sample))
            for (const row of sample.splice(0)) write(row)
            continue
          }
          write(raw)
        }
        await afterBatch()
      }
      if (!header) throw new UnreadableFile('No readable columns: the file holds no rows at all.')
      if (!plan) {
        ;({ plan, groupCodes, cube, frequent } = startCounting(header, sample))
        for (const row of sample.splice(0)) write(row)
        await afterBatch()
      }
      // A header of no names over cells that are all blank (or JSON records without keys) gives nothing to test.
      if (!named && plan.every(({ profile }) => profile.blank === rowNo)) throw new UnreadableFile('No readable columns: the file has no column names and no values.')
      if (rowNo === 0) throw new UnreadableFile('The file has a header but no rows of data.')
      await rowsOut.end()
      await digitsOut.end()
    }
    catch (error) {
      await Promise.all([rowsOut.abort(), digitsOut.abort()])
      await dropStaging(db.rows, datasetId)
      throw error
    }

    try {
      await finish(db, datasetBytes, plan!, groupCodes!, cube!, frequent, rowNo, ragged, source.meta, encoding)
    }
    catch (error) {
      await dropStaging(db.rows, datasetId)
      throw error
    }
  })

  /** How often each column's leading value (per sign) occurs, counted over its digit records. */
  async function leaderCounts(frequent: ReturnType<typeof startCounting>['frequent']) {
    const replacements: Record<string, unknown> = {}
    const candidates = frequent.flatMap((signs, position) => (signs ?? []).flatMap((values, side) => {
      const leader = values.leader()
      if (leader === null) return []
      const i = Object.keys(replacements).length
      replacements[`v${i}`] = leader
      return [`(${position}::smallint, ${side === 0 ? 1 : -1}::smallint, CAST(:v${i} AS numeric))`]
    }))
    if (!candidates.length) return []
    return sequelize.query<{ column_pos: number, sign: number, top: number }>(
      `SELECT column_pos, sign, count(*)::int AS top FROM ${names.digits}
       WHERE status = 3 AND (column_pos, sign, value) IN (VALUES ${candidates.join(', ')}) GROUP BY 1, 2`,
      { replacements, type: QueryTypes.SELECT },
    )
  }

  async function finish(db: Connections, datasetBytes: Buffer, columns: NonNullable<ReturnType<typeof planColumns>>, groupCodes: GroupCodes, cube: DigitCubeCounter, frequent: ReturnType<typeof startCounting>['frequent'], rowNo: number, ragged: number, meta: { delimiter: string | null, extraFields: number }, encoding: string) {
    // The slow parts run side by side on the import's two connections and a third from the pool:
    // the digit counts and the dictionary, the indexes for drill-down, planner statistics, and the
    // exact count of each column's most frequent value (frequent-values.ts).
    const [tops] = await Promise.all([
      leaderCounts(frequent),
      (async () => {
        const counts = await CopyWriter.open(db.rows, names.cube, 'digit_cube', CUBE_COLUMNS, onlyThis)
        cube.write(counts, datasetBytes)
        await counts.end()
        const dictionary = await CopyWriter.open(db.rows, names.groupValues, 'dataset_group_values', GROUP_VALUE_COLUMNS)
        for (const [position, code, value] of groupCodes.dictionary()) writeGroupValue(dictionary, datasetBytes, position, code, value)
        await dictionary.end()
        await db.rows.query(`CREATE INDEX ON ${names.rows} (row_no); ANALYZE ${names.rows}; ANALYZE ${names.cube};`)
      })(),
      // Drill-down walks a column's records in row order and stops after a page.
      db.digits.query(`CREATE INDEX ON ${names.digits} (column_pos, row_no); ANALYZE ${names.digits};`),
    ])
    const topOf = (position: number, sign: number) => tops.find(r => r.column_pos === position && r.sign === sign)?.top ?? 0

    const ready = dataset!
    await sequelize.transaction(async (transaction) => {
      await sequelize.query(`
        ALTER TABLE dataset_rows ATTACH PARTITION ${names.rows} FOR VALUES IN ('${datasetId}');
        ALTER TABLE digit_records ATTACH PARTITION ${names.digits} FOR VALUES IN ('${datasetId}');
        ALTER TABLE digit_cube ATTACH PARTITION ${names.cube} FOR VALUES IN ('${datasetId}');
        INSERT INTO dataset_group_values SELECT * FROM ${names.groupValues};
        DROP TABLE ${names.groupValues};
      `, { transaction })
      await models.DatasetColumn.bulkCreate(columns.map(({ profile }, position) => ({
        datasetId,
        position,
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
        coded: groupCodes.isCoded(position),
        cubeGroups: profile.numeric ? cube.groupingsOf(position) : null,
        profiles: profile.numeric
          ? { positive: profile.bySign.positive.toProfile(topOf(position, 1)), negative: profile.bySign.negative.toProfile(topOf(position, -1)) }
          : null,
      })), { transaction })
      await ready.update({
        status: 'ready', progress: 1, rowCount: rowNo, raggedRows: ragged + meta.extraFields,
        encoding, delimiter: meta.delimiter, readyAt: new Date(),
      }, { transaction })
      await recordAudit({
        newsroomId: ready.newsroomId, actorId: ready.createdBy, action: 'dataset.imported',
        subjectType: 'dataset', subjectId: datasetId,
        detail: { title: ready.title, sha256: ready.sha256, rows: rowNo, columns: columns.length, ragged },
      }, transaction)
    })
  }
}
