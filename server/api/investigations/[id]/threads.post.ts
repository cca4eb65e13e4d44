import { idParamsSchema } from '#shared/schemas/auth'
import { threadStartSchema } from '#shared/schemas/conversation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { startThread } from '#server/services/conversation/threads'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { subjectType, subjectId, parts } = await readInput(event, threadStartSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'conversation.write', { newsroomId: investigation.newsroomId })
  setResponseStatus(event, 201)
  return startThread(actor, investigation, { type: subjectType, id: subjectId }, parts)
})
