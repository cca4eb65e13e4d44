import { idParamsSchema } from '#shared/schemas/auth'
import { disputeSchema } from '#shared/schemas/investigation'
import { disputeClaim, findClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { note } = await readInput(event, disputeSchema)
  const { claim, investigation } = await findClaim(id)
  const actor = await requirePermission(event, 'claim.verify', { newsroomId: investigation.newsroomId })
  return disputeClaim(actor, claim, investigation, note)
})
