import { idParamsSchema } from '#shared/schemas/auth'
import { claimQuerySchema, disputeSchema } from '#shared/schemas/investigation'
import { disputeClaim, findClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  const { investigationId } = readQuery(event, claimQuerySchema)
  const { note } = await readInput(event, disputeSchema)
  const { claim, investigation } = await findClaim(user.id, { id, investigationId })
  const actor = await requirePermission(event, 'claim.verify', { newsroomId: investigation.newsroomId })
  return disputeClaim(actor, claim, investigation, note)
})
