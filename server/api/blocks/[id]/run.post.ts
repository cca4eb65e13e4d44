import { idParamsSchema } from '#shared/schemas/auth'
import { findBlock } from '#server/services/investigations/blocks'
import { runAnalysis } from '#server/services/investigations/analysis'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { block, investigation } = await findBlock(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return runAnalysis(block, investigation.newsroomId)
})
