import { idParamsSchema, roleChangeSchema } from '#shared/schemas/auth'
import { changeRole, findMembership } from '#server/services/members'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { role } = await readInput(event, roleChangeSchema)
  const membership = await findMembership(id)
  const actor = await requirePermission(event, 'member.changeRole', { newsroomId: membership.newsroomId as string })
  await changeRole(actor, id, role)
  return { ok: true }
})
