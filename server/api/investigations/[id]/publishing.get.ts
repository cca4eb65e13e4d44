import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '#server/services/investigations/catalog'
import { publishingPanel } from '#server/services/publishing/publish'

// The publishing panel: what still blocks a clean publication, who did each check, and the links
// made so far (with their addresses for members who may publish).
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return publishingPanel(actor, investigation)
})
