import { idParamsSchema } from '#shared/schemas/auth'
import { blockOrderSchema } from '#shared/schemas/investigation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { reorderBlocks } from '#server/services/investigations/blocks'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { layoutVersion, blockIds } = await readInput(event, blockOrderSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return reorderBlocks(actor, investigation, layoutVersion, blockIds)
})
