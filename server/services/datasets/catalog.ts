import { LRUCache } from 'lru-cache'
import { createHash } from 'node:crypto'
import type { Readable } from 'node:stream'
import { Op } from 'sequelize'
import type { ColumnDTO, ColumnKind, DatasetDTO, DatasetSummaryDTO } from '#shared/types/dataset'
import type { Dataset, DatasetColumn } from '../../models'
import { dropPartitionsSql } from './partitions'
import { readingsOf } from './readings'

function summary(dataset: Dataset, creator: string): DatasetSummaryDTO {
  return {
    id: dataset.id, title: dataset.title, status: dataset.status, progress: dataset.progress, error: dataset.error ?? null,
    rowCount: dataset.rowCount ?? null, byteSize: dataset.byteSize, originalName: dataset.originalName,
    createdAt: dataset.createdAt.toISOString(), createdBy: creator, archived: Boolean(dataset.archivedAt),
    obtainedOn: dataset.obtainedOn, sha256: dataset.sha256, sheet: dataset.sheet ?? null,
    readingGroup: dataset.readingOf ?? dataset.id, readingNo: dataset.readingNo,
  }
}

function columnDTO(column: DatasetColumn): ColumnDTO {
  const numeric = column.decimalMark !== null
  return {
    name: column.name, position: column.position, kind: column.kind as ColumnKind, numeric, decimalMark: column.decimalMark as ColumnDTO['decimalMark'],
    parsed: numeric ? column.parsed : null, blank: column.blank, unreadable: numeric ? column.unreadable : null,
    zero: numeric ? column.zero : null, negative: numeric ? column.negative : null,
    min: column.min, max: column.max, magnitudeSpan: column.magnitudeSpan, samples: column.samples, coded: column.coded,
    dates: column.dates ?? null,
  }
}

/** A newsroom's datasets, newest first; `search` finds words in the title, source note, source link or file name. */
export async function listDatasets(newsroomId: string, search?: string): Promise<DatasetSummaryDTO[]> {
  const { Dataset, User } = useDb().models
  const pattern = search ? `%${search.replace(/[\\%_]/g, match => `\\${match}`)}%` : null
  const rows = await Dataset.findAll({
    where: pattern
      ? { newsroomId, [Op.or]: ['title', 'sourceNote', 'sourceUrl', 'originalName'].map(field => ({ [field]: { [Op.iLike]: pattern } })) }
      : { newsroomId },
    include: [{ model: User, as: 'creator', attributes: ['name'] }],
    order: [['createdAt', 'DESC']],
  })
  return rows.map(row => summary(row, (row.get('creator') as { name: string } | null)?.name ?? ''))
}

/** The dataset behind an id, for the permission check; 404 when there is none. */
export async function findDataset(id: string): Promise<Dataset> {
  const dataset = await useDb().models.Dataset.findByPk(id)
  if (!dataset) throw fail(404)
  newsroomOf.set(id, dataset.newsroomId)
  return dataset
}

/** A dataset never moves to another newsroom: each server keeps the newsroom of the datasets it has read. */
const newsroomOf = new LRUCache<string, string>({ max: 20_000 })

/**
 * The dataset behind an id, and what `permitted` answers for its newsroom (the route's permission
 * check). When this server has read the dataset before, both are asked at once: a question's two
 * lookups then cost one wait for the database, not two. The answer is as if asked one after the
 * other: 404 when the dataset is gone, else whatever the check throws.
 */
export async function findPermittedDataset<T>(id: string, permitted: (newsroomId: string) => Promise<T>): Promise<{ dataset: Dataset, actor: T }> {
  const known = newsroomOf.get(id)
  if (!known) {
    const dataset = await findDataset(id)
    return { dataset, actor: await permitted(dataset.newsroomId) }
  }
  const [row, check] = await Promise.allSettled([findDataset(id), permitted(known)])
  if (row.status === 'rejected') throw row.reason
  if (check.status === 'rejected') throw check.reason
  return { dataset: row.value, actor: check.value }
}

/** The dataset's columns, in file order. */
/** A ready dataset's columns never change (they are written with its "ready"): each server keeps the latest few hundred. */
const keptColumns = new LRUCache<string, ColumnDTO[]>({ max: 500 })

export async function datasetColumns(datasetId: string): Promise<ColumnDTO[]> {
  const hit = keptColumns.get(datasetId)
  if (hit) return hit
  const rows = await useDb().models.DatasetColumn.findAll({ where: { datasetId }, order: [['position', 'ASC']] })
  const columns = rows.map(columnDTO)
  if (columns.length) keptColumns.set(datasetId, columns)
  return columns
}

export async function describeDataset(dataset: Dataset): Promise<DatasetDTO> {
  const creator = await useDb().models.User.findByPk(dataset.createdBy, { attributes: ['name'] })
  return {
    ...summary(dataset, creator?.name ?? ''),
    newsroomId: dataset.newsroomId, createdById: dataset.createdBy, sourceNote: dataset.sourceNote, sourceUrl: dataset.sourceUrl,
    format: dataset.format, encoding: dataset.encoding ?? null,
    compression: dataset.compression ?? null, archiveEntry: dataset.archiveEntry ?? null, sheets: dataset.sheets ?? null,
    delimiter: dataset.delimiter ?? null, raggedRows: dataset.raggedRows, replacesId: dataset.replacesId,
    columns: await datasetColumns(dataset.id), columnReadings: dataset.columnReadings ?? {}, readings: await readingsOf(dataset),
  }
}

export async function archiveDataset(actor: Actor, dataset: Dataset) {
  if (dataset.archivedAt) return
  await useDb().sequelize.transaction(async (transaction) => {
    await dataset.update({ archivedAt: new Date() }, { transaction })
    await recordAudit({ newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.archived', subjectType: 'dataset', subjectId: dataset.id, detail: { title: dataset.title } }, transaction)
  })
}

export async function restoreDataset(actor: Actor, dataset: Dataset) {
  if (!dataset.archivedAt) return
  await useDb().sequelize.transaction(async (transaction) => {
    await dataset.update({ archivedAt: null }, { transaction })
    await recordAudit({ newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.restored', subjectType: 'dataset', subjectId: dataset.id, detail: { title: dataset.title } }, transaction)
  })
}

/**
 * The original bytes as they were uploaded, once they are checked against the fingerprint taken
 * at upload: a file damaged in storage is refused, never handed out as the source.
 */
export async function originalBytes(dataset: Dataset): Promise<Readable> {
  const files = useFileStore()
  if (!await files.exists(dataset.storageKey)) {
    throw fail(500, { message: 'The stored file of this dataset is missing, so it cannot be handed out. Tell your admin: the file storage may have lost it.' })
  }
  const hash = createHash('sha256')
  for await (const chunk of await files.open(dataset.storageKey, 0)) hash.update(chunk as Buffer)
  if (hash.digest('hex') !== dataset.sha256) {
    throw fail(500, { message: 'The stored file no longer matches the fingerprint it had when it was uploaded, so it is not handed out. Tell your admin: the file storage may be damaged.' })
  }
  return files.open(dataset.storageKey, 0)
}

/** Deletes a dataset that no investigation uses: its partitions, columns, row and (unless shared) stored file. */
export async function deleteDataset(actor: Actor, dataset: Dataset) {
  const { sequelize, models } = useDb()
  const used = await models.Block.count({ where: { kind: 'analysis', deletedAt: null, settings: { datasetId: dataset.id } } })
  if (used > 0) throw fail(409, { message: 'An investigation uses this dataset, so it cannot be deleted. Archive it instead.' })
  if (dataset.status === 'importing') throw fail(409, { message: 'This dataset is still importing. Wait until it is ready or failed.' })
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(dropPartitionsSql(dataset.id), { transaction })
    await models.Dataset.update({ replacesId: null }, { where: { replacesId: dataset.id }, transaction })
    // The first reading of an upload gone, the next one left becomes the first its later ones name.
    await sequelize.query(`
      WITH heir AS (SELECT id FROM datasets WHERE reading_of = :id ORDER BY reading_no LIMIT 1),
      moved AS (UPDATE datasets SET reading_of = (SELECT id FROM heir) WHERE reading_of = :id AND id <> (SELECT id FROM heir))
      UPDATE datasets SET reading_of = NULL WHERE id = (SELECT id FROM heir)`, { replacements: { id: dataset.id }, transaction })
    await dataset.destroy({ transaction })
    await recordAudit({ newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.deleted', subjectType: 'dataset', subjectId: dataset.id, detail: { title: dataset.title, sha256: dataset.sha256 } }, transaction)
  })
  if (await models.Dataset.count({ where: { storageKey: dataset.storageKey } }) === 0) await useFileStore().remove(dataset.storageKey)
}
