import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '#server/services/investigations/catalog'
import { listShareLinks, publishBlockers } from '#server/services/publishing/publish'

// The publishing panel: what still blocks a clean publication, and the links made so far.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return { blockers: await publishBlockers(investigation), links: await listShareLinks(investigation) }
})
