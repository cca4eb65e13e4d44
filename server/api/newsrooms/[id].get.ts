import { idParamsSchema } from '#shared/schemas/auth'
import { describeNewsroom } from '#server/services/members'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const actor = await requirePermission(event, 'newsroom.read', { newsroomId: id })
  return describeNewsroom(id, actor.role)
})
