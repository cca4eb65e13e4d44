import { idParamsSchema } from '#shared/schemas/auth'
import { claimQuerySchema, verifySchema } from '#shared/schemas/investigation'
import { findClaim, verifyClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  const { investigationId } = readQuery(event, claimQuerySchema)
  const read = await readInput(event, verifySchema)
  const { claim, investigation } = await findClaim(user.id, { id, investigationId })
  const actor = await requirePermission(event, 'claim.verify', { newsroomId: investigation.newsroomId })
  return verifyClaim(actor, claim, read)
})
