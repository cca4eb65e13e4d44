import type { ColumnDTO, ColumnKind, DatasetDTO, DatasetSummaryDTO } from '#shared/types/dataset'
import type { Dataset, DatasetColumn } from '../../models'
import { dropPartitionsSql } from './partitions'

function summary(dataset: Dataset, creator: string): DatasetSummaryDTO {
  return {
    id: dataset.id, title: dataset.title, status: dataset.status, progress: dataset.progress, error: dataset.error ?? null,
    rowCount: dataset.rowCount ?? null, byteSize: dataset.byteSize, originalName: dataset.originalName,
    createdAt: dataset.createdAt.toISOString(), createdBy: creator, archived: Boolean(dataset.archivedAt),
  }
}

function columnDTO(column: DatasetColumn): ColumnDTO {
  const numeric = column.decimalMark !== null
  return {
    name: column.name, position: column.position, kind: column.kind as ColumnKind, numeric,
    parsed: numeric ? column.parsed : null, blank: column.blank, unreadable: numeric ? column.unreadable : null,
    zero: numeric ? column.zero : null, negative: numeric ? column.negative : null,
    min: column.min, max: column.max, magnitudeSpan: column.magnitudeSpan, samples: column.samples, coded: column.coded,
  }
}

export async function listDatasets(newsroomId: string): Promise<DatasetSummaryDTO[]> {
  const { Dataset, User } = useDb().models
  const rows = await Dataset.findAll({
    where: { newsroomId },
    include: [{ model: User, as: 'creator', attributes: ['name'] }],
    order: [['createdAt', 'DESC']],
  })
  return rows.map(row => summary(row, (row.get('creator') as { name: string } | null)?.name ?? ''))
}

/** The dataset behind an id, for the permission check; 404 when there is none. */
export async function findDataset(id: string): Promise<Dataset> {
  const dataset = await useDb().models.Dataset.findByPk(id)
  if (!dataset) throw fail(404)
  return dataset
}

/** The dataset's columns, in file order. */
export async function datasetColumns(datasetId: string): Promise<ColumnDTO[]> {
  const rows = await useDb().models.DatasetColumn.findAll({ where: { datasetId }, order: [['position', 'ASC']] })
  return rows.map(columnDTO)
}

export async function describeDataset(dataset: Dataset): Promise<DatasetDTO> {
  const creator = await useDb().models.User.findByPk(dataset.createdBy, { attributes: ['name'] })
  return {
    ...summary(dataset, creator?.name ?? ''),
    newsroomId: dataset.newsroomId, sourceNote: dataset.sourceNote, sourceUrl: dataset.sourceUrl,
    obtainedOn: dataset.obtainedOn, sha256: dataset.sha256, format: dataset.format, encoding: dataset.encoding ?? null,
    compression: dataset.compression ?? null, archiveEntry: dataset.archiveEntry ?? null, sheet: dataset.sheet ?? null, sheets: dataset.sheets ?? null,
    delimiter: dataset.delimiter ?? null, raggedRows: dataset.raggedRows, replacesId: dataset.replacesId,
    columns: await datasetColumns(dataset.id),
  }
}

export async function archiveDataset(actor: Actor, dataset: Dataset) {
  if (dataset.archivedAt) return
  await useDb().sequelize.transaction(async (transaction) => {
    await dataset.update({ archivedAt: new Date() }, { transaction })
    await recordAudit({ newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.archived', subjectType: 'dataset', subjectId: dataset.id, detail: { title: dataset.title } }, transaction)
  })
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
    await dataset.destroy({ transaction })
    await recordAudit({ newsroomId: actor.newsroomId, actorId: actor.userId, action: 'dataset.deleted', subjectType: 'dataset', subjectId: dataset.id, detail: { title: dataset.title, sha256: dataset.sha256 } }, transaction)
  })
  if (await models.Dataset.count({ where: { storageKey: dataset.storageKey } }) === 0) await useFileStore().remove(dataset.storageKey)
}
