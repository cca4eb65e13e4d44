import { idParamsSchema } from '#shared/schemas/auth'
import { claimQuerySchema, claimRemoveSchema } from '#shared/schemas/investigation'
import { findClaim } from '#server/services/investigations/claims'
import { removeClaim } from '#server/services/investigations/claim-removal'

// An open claim is unmarked by whoever may mark claims there; a disputed one needs a data editor.
export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  const { investigationId } = readQuery(event, claimQuerySchema)
  const { reason } = await readInput(event, claimRemoveSchema)
  const { claim, investigation } = await findClaim(user.id, { id, investigationId })
  const actor = await requirePermission(event, claim.status === 'disputed' ? 'claim.remove' : 'claim.mark', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  await removeClaim(actor, claim, reason)
  return { ok: true }
})
