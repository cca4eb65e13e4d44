import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '#server/services/investigations/catalog'
import { findShareLink, revokeShareLink } from '#server/services/publishing/publish'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const link = await findShareLink(id)
  const investigation = await findInvestigation(link.investigationId)
  const actor = await requirePermission(event, 'investigation.publish', { newsroomId: investigation.newsroomId })
  return revokeShareLink(actor, link)
})
