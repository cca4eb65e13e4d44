import { QueryTypes } from 'sequelize'
import { importDataset } from './import'
import { importSlot } from './import-slots'
import { dropPartitionsSql } from './partitions'
import { UnreadableFile } from './sniff'
import { INLINE_BYTES } from './upload'
import { IMPORT_QUEUE } from '../../utils/jobs'

const INTERNAL = 'The import stopped because of a problem on our side. Nothing from this file was kept; upload it again, and tell your data editor if it happens twice.'
const ABANDONED = 'The import stopped when the server running it went away. Nothing from this file was kept; upload it again.'

// How long a failed import waits for the database to come back before the job is handed back to the queue.
const WAIT_FOR_DATABASE_MS = 5 * 60_000
const RETRY_EVERY_MS = 1000
// An upload imported while its request waits is at most INLINE_BYTES, read in seconds: one still
// "importing" after this long lost the server that ran it.
const INLINE_GIVE_UP_MINUTES = 10

/**
 * Fails the dataset with `reason` and drops whatever its import left behind, in one transaction.
 * Only an import that is still "importing" is touched: a commit whose reply was lost on the way
 * (the dataset is in fact ready) keeps its partitions.
 */
async function markFailed(datasetId: string, reason: string): Promise<void> {
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const [count] = await models.Dataset.update({ status: 'failed', error: reason }, { where: { id: datasetId, status: 'importing' }, transaction })
    if (count === 1) await sequelize.query(dropPartitionsSql(datasetId), { transaction })
  })
}

/** markFailed, retried while the database is out of reach (a restart takes seconds). */
async function markFailedWhenReachable(datasetId: string, reason: string): Promise<void> {
  const until = Date.now() + WAIT_FOR_DATABASE_MS
  for (;;) {
    try {
      return await markFailed(datasetId, reason)
    }
    catch (error) {
      if (Date.now() > until) throw error
      await new Promise(resolve => setTimeout(resolve, RETRY_EVERY_MS))
    }
  }
}

/**
 * Runs one import and records its outcome. A file that cannot be read fails the dataset with
 * the reason; anything else (the database going away included) fails it with a general reason
 * once the database answers again, so a reporter never watches an import that is no longer
 * running. Only when the database stays away for minutes does the error reach the queue, which
 * tries the job again from nothing.
 */
export async function runImportJob(datasetId: string): Promise<void> {
  const slot = await importSlot()
  try {
    await importDataset(datasetId)
  }
  catch (error) {
    const reason = error instanceof UnreadableFile ? error.message : INTERNAL
    if (!(error instanceof UnreadableFile)) console.error(`[import] ${datasetId}:`, error)
    await markFailedWhenReachable(datasetId, reason)
  }
  finally {
    slot()
  }
}

/**
 * Fails imports that nothing is running any more: a queued import whose job is no longer waiting
 * or running, and an inline import whose request died with its server. Returns their ids. (The
 * minute of grace covers an upload between creating its dataset and queueing its job.)
 */
export async function failAbandonedImports(): Promise<string[]> {
  const { sequelize } = useDb()
  const abandoned = await sequelize.query<{ id: string }>(`
    SELECT d.id FROM datasets d
    WHERE d.status = 'importing' AND d.created_at < now() - interval '1 minute' AND CASE
      -- Queued: large files, and small ones that arrived while every import slot was taken.
      WHEN d.byte_size > :inlineBytes OR EXISTS (SELECT 1 FROM pgboss.job j WHERE j.name = :queue AND j.data->>'datasetId' = d.id::text) THEN NOT EXISTS (
        SELECT 1 FROM pgboss.job j
        WHERE j.name = :queue AND j.data->>'datasetId' = d.id::text AND j.state IN ('created', 'retry', 'active'))
      ELSE d.created_at < now() - make_interval(mins => :minutes)
    END`, { replacements: { inlineBytes: INLINE_BYTES, queue: IMPORT_QUEUE, minutes: INLINE_GIVE_UP_MINUTES }, type: QueryTypes.SELECT })
  for (const { id } of abandoned) await markFailed(id, ABANDONED)
  return abandoned.map(({ id }) => id)
}
