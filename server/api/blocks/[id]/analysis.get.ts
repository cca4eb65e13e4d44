import { idParamsSchema } from '#shared/schemas/auth'
import { findBlock } from '#server/services/investigations/blocks'
import { cachedAnalysis } from '#server/services/investigations/analysis'

// The stored result of the block's current settings (null when not run yet); never computes.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { block, investigation } = await findBlock(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return cachedAnalysis(block)
})
