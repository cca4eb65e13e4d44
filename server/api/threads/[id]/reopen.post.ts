import { idParamsSchema } from '#shared/schemas/auth'
import { findThread, setResolved } from '#server/services/conversation/threads'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { thread, investigation } = await findThread(id)
  const actor = await requirePermission(event, 'conversation.write', { newsroomId: investigation.newsroomId })
  return setResolved(actor, thread, false)
})
