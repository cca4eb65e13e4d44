import { idParamsSchema } from '#shared/schemas/auth'
import { findMembership, removeMember } from '#server/services/members'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const membership = await findMembership(id)
  const actor = await requirePermission(event, 'member.remove', { newsroomId: membership.newsroomId as string })
  await removeMember(actor, id)
  return { ok: true }
})
