import { IMPORT_QUEUE } from '../utils/jobs'
import { runImportJob } from '../services/datasets/import-job'

export default defineNitroPlugin(async (nitro) => {
  const boss = await useJobs()
  await boss.work<{ datasetId: string }>(IMPORT_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await runImportJob(job.data.datasetId)
  })
  nitro.hooks.hook('close', () => boss.stop({ graceful: true, timeout: 10_000 }))
})
