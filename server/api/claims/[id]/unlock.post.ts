import { idParamsSchema } from '#shared/schemas/auth'
import { unlockSchema } from '#shared/schemas/investigation'
import { findClaim, unlockClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { reason } = await readInput(event, unlockSchema)
  const { claim, investigation } = await findClaim(id)
  const actor = await requirePermission(event, 'lock.lift', { newsroomId: investigation.newsroomId })
  return unlockClaim(actor, claim, investigation, reason)
})
