import { idParamsSchema } from '#shared/schemas/auth'
import { blockCreateSchema } from '#shared/schemas/investigation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { createBlock } from '#server/services/investigations/blocks'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const input = await readInput(event, blockCreateSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  setResponseStatus(event, 201)
  return createBlock(actor, investigation, input)
})
