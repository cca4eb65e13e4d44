import type { Transaction } from 'sequelize'
import type { Role } from '#shared/auth/roles'
import type { MemberDTO, NewsroomDTO } from '#shared/types/dto'
import type { Actor } from '../utils/permissions'

export async function listMembers(newsroomId: string): Promise<MemberDTO[]> {
  const { Membership, User } = useDb().models
  const rows = await Membership.findAll({
    where: { newsroomId },
    include: [{ model: User, as: 'user' }],
    order: [['createdAt', 'ASC']],
  })
  return rows.map(m => ({
    membershipId: m.id,
    userId: m.userId as string,
    name: m.user?.name ?? '',
    email: m.user?.email ?? '',
    role: m.role,
    joinedAt: m.createdAt.toISOString(),
  }))
}

export async function describeNewsroom(newsroomId: string, role: Role): Promise<NewsroomDTO> {
  const { Newsroom, Membership } = useDb().models
  const newsroom = await Newsroom.findByPk(newsroomId)
  if (!newsroom) throw fail(404)
  const memberCount = await Membership.count({ where: { newsroomId } })
  return { id: newsroom.id, name: newsroom.name, role, memberCount, fourEyes: newsroom.fourEyes }
}

/** An admin turns the four-eyes rule on or off; the audit trail keeps who did and when. */
export async function updateNewsroomSettings(actor: Actor, settings: { fourEyes: boolean }): Promise<NewsroomDTO> {
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const newsroom = await models.Newsroom.findByPk(actor.newsroomId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!newsroom || newsroom.fourEyes === settings.fourEyes) return
    await newsroom.update({ fourEyes: settings.fourEyes }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, investigationId: null, actorId: actor.userId, action: 'newsroom.four-eyes',
      subjectType: 'newsroom', subjectId: actor.newsroomId, detail: { fourEyes: settings.fourEyes },
    }, transaction)
  })
  return describeNewsroom(actor.newsroomId, actor.role)
}

/** The membership behind an id, as the newsroom id the permission check needs; 404 when missing. */
export async function findMembership(membershipId: string) {
  const membership = await useDb().models.Membership.findByPk(membershipId)
  if (!membership) throw fail(404)
  return membership
}

/** A newsroom always keeps one admin: refuse a change that would leave none. */
async function assertAnotherAdmin(newsroomId: string, membershipId: string, transaction: Transaction) {
  const { Membership } = useDb().models
  const admins = await Membership.findAll({ where: { newsroomId, role: 'admin' }, transaction, lock: transaction.LOCK.UPDATE })
  if (!admins.some(a => a.id !== membershipId)) {
    throw fail(409, { message: 'A newsroom needs at least one admin. Make someone else admin first.' })
  }
}

export async function changeRole(actor: Actor, membershipId: string, role: Role) {
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const membership = await models.Membership.findByPk(membershipId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!membership || membership.newsroomId !== actor.newsroomId) throw fail(404)
    if (membership.role === role) return
    if (membership.role === 'admin') await assertAnotherAdmin(actor.newsroomId, membershipId, transaction)
    const from = membership.role
    await membership.update({ role }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, actorId: actor.userId, action: 'member.role-changed',
      subjectType: 'user', subjectId: membership.userId as string, detail: { from, to: role },
    }, transaction)
  })
}

export async function removeMember(actor: Actor, membershipId: string) {
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const membership = await models.Membership.findByPk(membershipId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!membership || membership.newsroomId !== actor.newsroomId) throw fail(404)
    if (membership.role === 'admin') await assertAnotherAdmin(actor.newsroomId, membershipId, transaction)
    await membership.destroy({ transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, actorId: actor.userId, action: 'member.removed',
      subjectType: 'user', subjectId: membership.userId as string, detail: { role: membership.role },
    }, transaction)
  })
}
