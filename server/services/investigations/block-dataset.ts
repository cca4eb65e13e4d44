import type { Transaction } from 'sequelize'
import type { AnalysisSettings } from '#shared/types/investigation'

/** A block may only point at a dataset of its own newsroom; `path` names the field that gave it. */
export async function checkDataset(settings: AnalysisSettings | undefined, newsroomId: string, transaction?: Transaction, path = 'settings.datasetId') {
  if (!settings?.datasetId) return
  const dataset = await useDb().models.Dataset.findOne({ where: { id: settings.datasetId, newsroomId }, attributes: ['id'], transaction })
  if (!dataset) throw fail(400, [{ path, message: 'Choose a dataset of this newsroom.' }])
}
