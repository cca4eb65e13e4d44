import { idParamsSchema, invitationCreateSchema } from '#shared/schemas/auth'
import { createInvitation } from '#server/services/invitations'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { email, role } = await readInput(event, invitationCreateSchema)
  const actor = await requirePermission(event, 'member.invite', { newsroomId: id })
  setResponseStatus(event, 201)
  return createInvitation(actor, email, role)
})
