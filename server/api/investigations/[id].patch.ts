import { idParamsSchema } from '#shared/schemas/auth'
import { investigationUpdateSchema } from '#shared/schemas/investigation'
import { findInvestigation, updateInvestigation } from '#server/services/investigations/catalog'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const patch = await readInput(event, investigationUpdateSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'investigation.edit', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return updateInvestigation(actor, investigation, patch)
})
