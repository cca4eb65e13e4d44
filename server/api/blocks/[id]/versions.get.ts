import { idParamsSchema } from '#shared/schemas/auth'
import { findBlock } from '#server/services/investigations/blocks'
import { blockHistory } from '#server/services/history/versions'

// A removed block's history stays readable: it is how one finds what it said.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { block, investigation } = await findBlock(id, { includeRemoved: true })
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return blockHistory(block)
})
