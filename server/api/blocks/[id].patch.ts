import { idParamsSchema } from '#shared/schemas/auth'
import { blockUpdateSchema } from '#shared/schemas/investigation'
import { findBlock, updateBlock } from '#server/services/investigations/blocks'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const input = await readInput(event, blockUpdateSchema)
  const { block, investigation } = await findBlock(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return updateBlock(actor, block, input)
})
