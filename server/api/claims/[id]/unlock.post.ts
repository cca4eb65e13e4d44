import { idParamsSchema } from '#shared/schemas/auth'
import { claimQuerySchema, unlockSchema } from '#shared/schemas/investigation'
import { findClaim, unlockClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  const { investigationId } = readQuery(event, claimQuerySchema)
  const { reason } = await readInput(event, unlockSchema)
  const { claim, investigation } = await findClaim(user.id, { id, investigationId })
  const actor = await requirePermission(event, 'lock.lift', { newsroomId: investigation.newsroomId })
  return unlockClaim(actor, claim, investigation, reason)
})
