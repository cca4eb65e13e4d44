import { idParamsSchema } from '#shared/schemas/auth'
import { findBlock, restoreBlock } from '#server/services/investigations/blocks'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { block, investigation } = await findBlock(id, { includeRemoved: true })
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return restoreBlock(actor, block)
})
