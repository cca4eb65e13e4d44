import { open } from 'node:fs/promises'
import type { PoolClient } from 'pg'
import { detectNumberStyle, recordOf, readNumber } from '#shared/digits'
import type { NumberStyle } from '#shared/digits'
import { ColumnProfile } from './column-profile'
import { CopyWriter, DIGIT_COLUMNS, GROUP_VALUE_COLUMNS, ROW_COLUMNS, digitLine, rowLine } from './bulk-copy'
import { GroupCodes } from './group-codes'
import { openRows } from './readers'
import { UnreadableFile, detectEncoding, detectFileEncoding } from './sniff'
import type { DatasetFormat } from './sniff'
import { partitionNames } from './partitions'

export const MAX_COLUMNS = 2000
const SAMPLE_ROWS = 1000
const PROGRESS_EVERY_MS = 500

function headerNames(raw: string[]): string[] {
  const seen = new Map<string, number>()
  return raw.map((cell, i) => {
    const base = cell.replace(/\s+/g, ' ').trim().slice(0, 200) || `Column ${i + 1}`
    const count = (seen.get(base) ?? 0) + 1
    seen.set(base, count)
    return count === 1 ? base : `${base} (${count})`
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
async function dropStaging(client: PoolClient, names: ReturnType<typeof partitionNames>) {
  await client.query(`DROP TABLE IF EXISTS ${names.rows}; DROP TABLE IF EXISTS ${names.digits}; DROP TABLE IF EXISTS ${names.groupValues};`).catch(() => {})
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
  const path = useFileStore().pathOf(dataset.storageKey)
  const handle = await open(path)
  const head = Buffer.alloc(64 * 1024)
  const { bytesRead } = await handle.read(head, 0, head.length, 0)
  await handle.close()
  const { encoding, bomLength } = dataset.format === 'xlsx'
    ? detectEncoding(head.subarray(0, bytesRead))
    : await detectFileEncoding(path, head.subarray(0, bytesRead))
  const names = partitionNames(datasetId)

  await withConnections(async (db) => {
    await db.rows.query(`DROP TABLE IF EXISTS ${names.rows}; DROP TABLE IF EXISTS ${names.digits};
      CREATE TABLE ${names.rows} (LIKE dataset_rows); CREATE TABLE ${names.digits} (LIKE digit_records);`)
    const rowsOut = new CopyWriter(db.rows, names.rows, ROW_COLUMNS)
    const digitsOut = new CopyWriter(db.digits, names.digits, DIGIT_COLUMNS)
    const source = openRows(dataset.format as DatasetFormat, path, encoding, bomLength)
    let header: string[] | null = null
    let named = false
    let plan: ReturnType<typeof planColumns> | null = null
    let groupCodes: GroupCodes | null = null
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
      rowsOut.add(rowLine(datasetId, rowNo, cells))
      const codes = groupCodes!.literal(cells)
      for (let c = 0; c < width; c++) {
        const column = plan![c]!
        const cell = cells[c]!
        if (!column.profile.numeric) {
          column.profile.addText(cell)
          continue
        }
        const record = recordOf(readNumber(cell, column.style))
        column.profile.addNumber(cell, record)
        digitsOut.add(digitLine(datasetId, c, rowNo, record, codes))
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
            plan = planColumns(header, sample)
            groupCodes = new GroupCodes(plan.map(c => !c.profile.numeric))
            for (const row of sample.splice(0)) write(row)
            continue
          }
          write(raw)
        }
        await afterBatch()
      }
      if (!header) throw new UnreadableFile('No readable columns: the file holds no rows at all.')
      if (!plan) {
        plan = planColumns(header, sample)
        groupCodes = new GroupCodes(plan.map(c => !c.profile.numeric))
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
      await dropStaging(db.rows, names)
      throw error
    }

    try {
      await finish(db, plan!, groupCodes!, rowNo, ragged, source.meta, encoding)
    }
    catch (error) {
      await dropStaging(db.rows, names)
      throw error
    }
  })

  async function finish(db: Connections, columns: NonNullable<ReturnType<typeof planColumns>>, groupCodes: GroupCodes, rowNo: number, ragged: number, meta: { delimiter: string | null, extraFields: number }, encoding: string) {
    // The most frequent value per column and sign needs every distinct value: counted once here.
    const tops = await db.digits.query<{ column_pos: number, sign: number, top: number }>(
      `SELECT column_pos, sign, max(c)::int AS top FROM (SELECT column_pos, sign, count(*) AS c FROM ${names.digits} WHERE status = 3 GROUP BY column_pos, sign, value) t GROUP BY 1, 2`,
    )
    const topOf = (position: number, sign: number) => tops.rows.find(r => r.column_pos === position && r.sign === sign)?.top ?? 0
    await db.rows.query(`DROP TABLE IF EXISTS ${names.groupValues}; CREATE TABLE ${names.groupValues} (LIKE dataset_group_values)`)
    const dictionary = new CopyWriter(db.rows, names.groupValues, GROUP_VALUE_COLUMNS)
    for (const line of groupCodes.dictionaryLines(datasetId)) dictionary.add(line)
    await dictionary.end()
    const ready = dataset!
    await sequelize.transaction(async (transaction) => {
      // The CHECK lets ATTACH skip its validation scan; the indexes serve drill-down and counting.
      await sequelize.query(`
        ALTER TABLE ${names.rows} ADD CONSTRAINT ${names.rows}_one CHECK (dataset_id = '${datasetId}');
        ALTER TABLE ${names.digits} ADD CONSTRAINT ${names.digits}_one CHECK (dataset_id = '${datasetId}');
        CREATE INDEX ON ${names.rows} (row_no);
        CREATE INDEX ON ${names.digits} (column_pos, row_no);
        ALTER TABLE dataset_rows ATTACH PARTITION ${names.rows} FOR VALUES IN ('${datasetId}');
        ALTER TABLE digit_records ATTACH PARTITION ${names.digits} FOR VALUES IN ('${datasetId}');
        ANALYZE ${names.rows}; ANALYZE ${names.digits};
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
