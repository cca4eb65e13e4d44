import { idParamsSchema } from '#shared/schemas/auth'
import { claimQuerySchema, claimUpdateSchema } from '#shared/schemas/investigation'
import { findClaim, updateClaimSupport } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  const { investigationId } = readQuery(event, claimQuerySchema)
  const { supportingBlockIds } = await readInput(event, claimUpdateSchema)
  const { claim, investigation } = await findClaim(user.id, { id, investigationId })
  const actor = await requirePermission(event, 'claim.mark', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return updateClaimSupport(actor, claim, supportingBlockIds)
})
