import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '#server/services/investigations/catalog'
import { requestReview } from '#server/services/investigations/review'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'review.request', { newsroomId: investigation.newsroomId, ownerId: investigation.createdBy })
  return requestReview(actor, investigation)
})
