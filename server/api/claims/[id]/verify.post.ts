import { idParamsSchema } from '#shared/schemas/auth'
import { verifySchema } from '#shared/schemas/investigation'
import { findClaim, verifyClaim } from '#server/services/investigations/claims'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const read = await readInput(event, verifySchema)
  const { claim, investigation } = await findClaim(id)
  const actor = await requirePermission(event, 'claim.verify', { newsroomId: investigation.newsroomId })
  return verifyClaim(actor, claim, read)
})
