import { idParamsSchema } from '#shared/schemas/auth'
import { messageSchema } from '#shared/schemas/conversation'
import { findThread, replyToThread } from '#server/services/conversation/threads'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { parts } = await readInput(event, messageSchema)
  const { thread, investigation } = await findThread(id)
  const actor = await requirePermission(event, 'conversation.write', { newsroomId: investigation.newsroomId })
  setResponseStatus(event, 201)
  return replyToThread(actor, investigation, thread, parts)
})
