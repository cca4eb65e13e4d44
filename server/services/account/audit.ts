import type { Transaction } from 'sequelize'

/**
 * Writes an account event (password, sessions, two-factor, sign-in delays) into the trail of every
 * newsroom the person belongs to: the trail is kept per newsroom, and each of them should see it.
 */
export async function recordAccountEvent(
  userId: string,
  action: string,
  detail: Record<string, unknown> = {},
  options: { actorId?: string | null, transaction?: Transaction } = {},
) {
  const memberships = await useDb().models.Membership.findAll({ where: { userId }, attributes: ['newsroomId'], transaction: options.transaction })
  for (const { newsroomId } of memberships) {
    await recordAudit({
      newsroomId: newsroomId as string, actorId: options.actorId === undefined ? userId : options.actorId,
      action, subjectType: 'user', subjectId: userId, detail,
    }, options.transaction)
  }
}
