import PgBoss from 'pg-boss'

export const IMPORT_QUEUE = 'dataset-import'

let starting: Promise<PgBoss> | undefined

/**
 * The durable job queue, kept in PostgreSQL (schema NUXT_JOBS_SCHEMA, "pgboss"), so that every
 * app server shares it and a job survives a restart. Servers that share a queue must share file
 * storage too: any of them may import any upload.
 */
export function useJobs(): Promise<PgBoss> {
  starting ??= (async () => {
    const { databaseUrl, jobs } = useRuntimeConfig()
    const boss = new PgBoss({ connectionString: databaseUrl, schema: jobs.schema, max: 4, maintenanceIntervalSeconds: Number(jobs.maintenanceSeconds) })
    boss.on('error', error => console.error('[jobs]', error.message))
    await boss.start()
    await boss.createQueue(IMPORT_QUEUE, {
      name: IMPORT_QUEUE,
      // A server that dies mid-import lets the job expire; the next try, on any server, starts it
      // again from nothing (the dead server's tables went with its uncommitted transactions).
      expireInSeconds: Number(jobs.expireSeconds),
      retryLimit: 2,
      retryDelay: 5,
    })
    return boss
  })()
  return starting
}

let importWorker: string | undefined

/** This server's import worker: a job queued here then starts at once instead of at the next poll. */
export function setImportWorker(id: string) {
  importWorker = id
}

/** Queues a dataset's import, to be run by whichever server's worker takes it first. */
export async function queueImport(datasetId: string): Promise<void> {
  const boss = await useJobs()
  await boss.send(IMPORT_QUEUE, { datasetId })
  if (importWorker) boss.notifyWorker(importWorker)
}
