import { idParamsSchema } from '#shared/schemas/auth'
import { listMembers } from '#server/services/members'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  await requirePermission(event, 'newsroom.read', { newsroomId: id })
  return listMembers(id)
})
