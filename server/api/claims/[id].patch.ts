import { idParamsSchema } from '#shared/schemas/auth'
import { claimUpdateSchema } from '#shared/schemas/investigation'
import { findClaim, updateClaimSupport } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { supportingBlockIds } = await readInput(event, claimUpdateSchema)
  const { claim, investigation } = await findClaim(id)
  const actor = await requirePermission(event, 'claim.mark', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return updateClaimSupport(actor, claim, supportingBlockIds)
})
