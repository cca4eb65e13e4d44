import { importDataset } from './import'
import { UnreadableFile } from './sniff'

const INTERNAL = 'The import stopped because of a problem on our side. Nothing from this file was kept; upload it again, and tell your data editor if it happens twice.'

/**
 * Runs one import and records its outcome. A file that cannot be read fails the dataset with
 * the reason; anything else fails it too, unless the database itself is unreachable, in which
 * case the job is handed back to the queue to try again.
 */
export async function runImportJob(datasetId: string): Promise<void> {
  try {
    await importDataset(datasetId)
  }
  catch (error) {
    const reason = error instanceof UnreadableFile ? error.message : INTERNAL
    if (!(error instanceof UnreadableFile)) console.error(`[import] ${datasetId}:`, error)
    await useDb().models.Dataset.update({ status: 'failed', error: reason }, { where: { id: datasetId, status: 'importing' } })
  }
}
