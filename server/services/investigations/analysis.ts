import { createHash } from 'node:crypto'
import { digitTestRequestSchema } from '#shared/schemas/dataset'
import type { AnalysisRunDTO, AnalysisSettings } from '#shared/types/investigation'
import type { Block } from '../../models'
import { findDataset } from '../datasets/catalog'
import { runDatasetTest } from '../datasets/digit-tests'

/** Equal settings always give the same cache key, whatever order their keys came in. */
export function cacheKeyOf(settings: AnalysisSettings): string {
  return createHash('sha256').update(canonicalJson(settings)).digest('hex')
}

function completeSettings(block: Block) {
  const settings = block.settings ?? {}
  if (!settings.datasetId) throw fail(400, [{ path: 'settings.datasetId', message: 'Choose a dataset first.' }])
  const parsed = digitTestRequestSchema.safeParse(settings)
  if (!parsed.success) throw fail(400, fieldErrors(parsed.error).map(e => ({ ...e, path: `settings.${e.path}` })))
  return { datasetId: settings.datasetId, request: parsed.data }
}

/** The stored result for the block's current settings, or null when it has not been run. */
export async function cachedAnalysis(block: Block): Promise<AnalysisRunDTO | null> {
  if (!block.settings?.datasetId) return null
  const hit = await useDb().models.AnalysisResult.findByPk(cacheKeyOf(block.settings))
  return hit ? { result: hit.result, cached: true } : null
}

/**
 * Runs the block's test on its dataset, or answers from the cache: datasets never change once
 * ready, so the same dataset and settings always give the same result.
 */
export async function runAnalysis(block: Block, newsroomId: string): Promise<AnalysisRunDTO> {
  const { datasetId, request } = completeSettings(block)
  const cached = await cachedAnalysis(block)
  if (cached) return cached
  const dataset = await findDataset(datasetId)
  if (dataset.newsroomId !== newsroomId) throw fail(404)
  const result = await runDatasetTest(dataset, request)
  await useDb().models.AnalysisResult.upsert({ cacheKey: cacheKeyOf(block.settings!), datasetId, result })
  return { result, cached: false }
}
