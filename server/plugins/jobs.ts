import { IMPORT_QUEUE, setImportWorker } from '../utils/jobs'
import { failAbandonedImports, runImportJob } from '../services/datasets/import-job'

// Often enough that an import left behind by a dead server does not sit "importing" for long.
const SWEEP_EVERY_MS = 60_000

async function sweep() {
  try {
    const failed = await failAbandonedImports()
    if (failed.length) console.warn(`[import] failed ${failed.length} import(s) that no server was running: ${failed.join(', ')}`)
  }
  catch (error) {
    console.error('[import] could not look for abandoned imports:', (error as Error).message)
  }
}

export default defineNitroPlugin(async (nitro) => {
  const boss = await useJobs()
  const worker = await boss.work<{ datasetId: string }>(IMPORT_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await runImportJob(job.data.datasetId)
  })
  setImportWorker(worker)
  await sweep()
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  nitro.hooks.hook('close', async () => {
    clearInterval(timer)
    await boss.stop({ graceful: true, timeout: 10_000 })
  })
})
