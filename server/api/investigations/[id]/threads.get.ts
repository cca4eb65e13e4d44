import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '#server/services/investigations/catalog'
import { listConversation } from '#server/services/conversation/threads'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return listConversation(investigation)
})
