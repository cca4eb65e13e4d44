import { z } from 'zod'
import { revokeInvitation } from '#server/services/invitations'

const paramsSchema = z.object({ id: z.string().uuid(), invitationId: z.string().uuid() })

export default defineEventHandler(async (event) => {
  const { id, invitationId } = readParams(event, paramsSchema)
  const actor = await requirePermission(event, 'member.invite', { newsroomId: id })
  await revokeInvitation(actor, invitationId)
  return { ok: true }
})
