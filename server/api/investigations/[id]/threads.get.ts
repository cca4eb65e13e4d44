import { idParamsSchema } from '#shared/schemas/auth'
import { findInvestigation } from '../../../services/investigations/catalog'
import { listConversation } from '../../../services/conversation/threads'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return listConversation(investigation)
})
