import { idParamsSchema } from '#shared/schemas/auth'
import { listPendingInvitations } from '#server/services/invitations'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  await requirePermission(event, 'member.invite', { newsroomId: id })
  return listPendingInvitations(id)
})
