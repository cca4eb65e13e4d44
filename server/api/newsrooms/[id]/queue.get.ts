import { idParamsSchema } from '#shared/schemas/auth'
import { can } from '#shared/auth/permissions'
import { reviewQueue } from '#server/services/investigations/review'
import { factCheckQueue } from '#server/services/investigations/claims'

// What waits for the member: methods to review (data editors) and claims to check (fact-checkers).
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const actor = await requirePermission(event, 'newsroom.read', { newsroomId: id })
  return {
    review: can(actor.role, 'block.review') ? await reviewQueue(id) : [],
    factCheck: can(actor.role, 'claim.verify') || can(actor.role, 'lock.lift') ? await factCheckQueue(id) : [],
  }
})
