import { QueryTypes } from 'sequelize'
import type { ColumnDTO, ColumnKind, ColumnReading, ColumnReadings, ReadingDTO } from '#shared/types/dataset'
import type { Dataset } from '../../models'
import type { Actor } from '../../utils/permissions'
import { datasetColumns } from './catalog'
import { canonicalJson } from '../../utils/fingerprint'
import { UnreadableFile } from './sniff'
import { startImport } from './upload'

const NUMBER_FIELDS = ['decimalMark', 'negatives', 'currency'] as const
const READ_AS_NUMBERS: ReadonlySet<ColumnKind> = new Set(['amount', 'count', 'identifier'])

/** The first reading of the dataset's upload: every reading of it names that one (migration 0060). */
export function readingGroupOf(dataset: Pick<Dataset, 'id' | 'readingOf'>): string {
  return dataset.readingOf ?? dataset.id
}

/** The readings asked for, checked against the columns they name; empty ones left out. */
function checkedReadings(columns: ColumnDTO[], asked: ColumnReadings): ColumnReadings {
  const errors: { path: string, message: string }[] = []
  const readings: ColumnReadings = {}
  for (const [name, reading] of Object.entries(asked)) {
    const column = columns.find(c => c.name === name)
    const path = `columns.${name}`
    if (!column) {
      errors.push({ path, message: `This dataset has no column named "${name}".` })
      continue
    }
    const kind = reading.kind ?? column.kind
    const asNumbers = reading.kind ? READ_AS_NUMBERS.has(reading.kind) : column.numeric
    for (const field of NUMBER_FIELDS) {
      if (reading[field] !== undefined && !asNumbers) errors.push({ path: `${path}.${field}`, message: `"${name}" is read as ${kind}: a ${field === 'currency' ? 'currency' : field === 'negatives' ? 'way of writing negatives' : 'decimal separator'} applies only to numbers.` })
    }
    if (reading.dateOrder !== undefined && kind !== 'date') errors.push({ path: `${path}.dateOrder`, message: `"${name}" is read as ${kind}: a date format applies only to dates.` })
    const kept = Object.fromEntries(Object.entries(reading).filter(([, value]) => value !== undefined)) as ColumnReading
    if (Object.keys(kept).length) readings[name] = kept
  }
  if (errors.length) throw fail(400, errors)
  return readings
}

/**
 * Reads a dataset's stored upload again with the columns read as the reporter says, into a new
 * version: a dataset of its own over the same bytes (same fingerprint, same source), numbered after
 * the upload's other readings. Nothing of the dataset read from changes, and the analysis blocks on
 * it stay there until someone moves them.
 */
export async function rereadDataset(actor: Actor, base: Dataset, asked: ColumnReadings): Promise<{ id: string, status: string, queued: boolean, readingNo: number }> {
  if (base.status !== 'ready') throw fail(409, { message: 'This dataset is not ready: only a dataset that imported can be read again.' })
  const readings = checkedReadings(await datasetColumns(base.id), asked)
  if (canonicalJson(readings) === canonicalJson(base.columnReadings ?? {})) {
    throw fail(400, [{ path: 'columns', message: 'Every column would be read as this version reads it: change at least one.' }])
  }
  const { sequelize, models } = useDb()
  const group = readingGroupOf(base)
  const dataset = await sequelize.transaction(async (transaction) => {
    // The first reading's row, locked, numbers the readings one at a time; the highest is read after the lock.
    await sequelize.query('SELECT id FROM datasets WHERE id = :group FOR UPDATE', { replacements: { group }, transaction })
    const [{ last }] = await sequelize.query<{ last: number }>(
      'SELECT coalesce(max(reading_no), 1)::int AS last FROM datasets WHERE id = :group OR reading_of = :group',
      { replacements: { group }, type: QueryTypes.SELECT, transaction },
    ) as [{ last: number }]
    const created = await models.Dataset.create({
      newsroomId: base.newsroomId, title: base.title, sourceNote: base.sourceNote, sourceUrl: base.sourceUrl, obtainedOn: base.obtainedOn,
      originalName: base.originalName, format: base.format, compression: base.compression, archiveEntry: base.archiveEntry,
      sheet: base.sheet, sha256: base.sha256, byteSize: base.byteSize, storageKey: base.storageKey, replacesId: base.replacesId,
      readingOf: group, readingNo: last + 1, columnReadings: readings, createdBy: actor.userId,
    }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.reread', subjectType: 'dataset', subjectId: created.id,
      detail: { title: base.title, sha256: base.sha256, from: base.id, readingNo: created.readingNo, readings },
    }, transaction)
    return created
  })
  try {
    return { ...await startImport(dataset.id, base.byteSize), readingNo: dataset.readingNo }
  }
  catch (error) {
    if (error instanceof UnreadableFile) throw fail(error.status, { message: error.message })
    throw error
  }
}

/** Every reading of the dataset's upload, first to last. */
export async function readingsOf(dataset: Dataset): Promise<ReadingDTO[]> {
  const { Dataset: Datasets, User } = useDb().models
  const group = readingGroupOf(dataset)
  const rows = await Datasets.findAll({
    where: useDb().sequelize.or({ id: group }, { readingOf: group }),
    include: [{ model: User, as: 'creator', attributes: ['name'] }],
    order: [['readingNo', 'ASC'], ['createdAt', 'ASC']],
  })
  return rows.map(row => ({
    id: row.id, readingNo: row.readingNo, status: row.status, archived: Boolean(row.archivedAt), createdAt: row.createdAt.toISOString(),
    createdBy: (row.get('creator') as { name: string } | null)?.name ?? '', readings: row.columnReadings ?? {},
  }))
}
