import { idParamsSchema } from '#shared/schemas/auth'
import { claimCreateSchema } from '#shared/schemas/investigation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { createClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const input = await readInput(event, claimCreateSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'claim.mark', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  setResponseStatus(event, 201)
  return createClaim(actor, investigation, input)
})
