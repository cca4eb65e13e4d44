import { idParamsSchema } from '#shared/schemas/auth'
import { findBlock, removeBlock } from '#server/services/investigations/blocks'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { block, investigation } = await findBlock(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  await removeBlock(actor, block)
  return { ok: true }
})
