import type { Transaction } from 'sequelize'
import { can } from '#shared/auth/permissions'
import type { Action } from '#shared/auth/permissions'
import type { Role } from '#shared/auth/roles'
import type { MemberDTO, NewsroomDTO } from '#shared/types/dto'
import type { Actor } from '../utils/permissions'
import { endSessionsOf } from './account/sessions'

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
  return { id: newsroom.id, name: newsroom.name, role, memberCount, fourEyes: newsroom.fourEyes, requireTwoFactor: newsroom.requireTwoFactor }
}

/**
 * An admin changes the newsroom's settings (four eyes, two-factor sign-in for every member); the
 * audit trail keeps who did and when. Requiring two-factor sign-in asks the admin to use it first,
 * so the one who turns it on is never the one it shuts out.
 */
export async function updateNewsroomSettings(actor: Actor, settings: { fourEyes?: boolean, requireTwoFactor?: boolean }): Promise<NewsroomDTO> {
  const { sequelize, models } = useDb()
  if (settings.requireTwoFactor && !actor.secondFactor) {
    throw fail(409, { message: 'Turn on two-factor sign-in for your own account and sign in with it first.' })
  }
  await sequelize.transaction(async (transaction) => {
    const newsroom = await models.Newsroom.findByPk(actor.newsroomId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!newsroom) return
    const audit = (action: string, detail: Record<string, unknown>) => recordAudit({
      newsroomId: actor.newsroomId, investigationId: null, actorId: actor.userId, action,
      subjectType: 'newsroom', subjectId: actor.newsroomId, detail,
    }, transaction)
    if (settings.fourEyes !== undefined && newsroom.fourEyes !== settings.fourEyes) {
      await newsroom.update({ fourEyes: settings.fourEyes }, { transaction })
      await audit('newsroom.four-eyes', { fourEyes: settings.fourEyes })
    }
    if (settings.requireTwoFactor !== undefined && newsroom.requireTwoFactor !== settings.requireTwoFactor) {
      await newsroom.update({ requireTwoFactor: settings.requireTwoFactor }, { transaction })
      await audit('newsroom.two-factor', { requireTwoFactor: settings.requireTwoFactor })
    }
  })
  return describeNewsroom(actor.newsroomId, actor.role)
}

/** The membership behind an id, as the newsroom id the permission check needs; 404 when missing. */
export async function findMembership(membershipId: string) {
  const membership = await useDb().models.Membership.findByPk(membershipId)
  if (!membership) throw fail(404)
  return membership
}

/**
 * Locks a membership for a change, in the one order membership changes use: the newsroom's row
 * first, then the membership's. Two admins demoting each other at once then queue on the newsroom
 * row (the second sees the first's change and the one-admin rule) instead of deadlocking on each
 * other's memberships. 404 unless the membership is of the actor's newsroom.
 */
async function lockMembership(actor: Actor, action: Action, membershipId: string, transaction: Transaction) {
  const { Newsroom, Membership } = useDb().models
  await Newsroom.findByPk(actor.newsroomId, { transaction, lock: transaction.LOCK.UPDATE })
  // Asked again under the lock: a change that waited may come from someone demoted meanwhile.
  const own = await Membership.findOne({ where: { newsroomId: actor.newsroomId, userId: actor.userId }, transaction })
  if (!own) throw fail(404)
  if (!can(own.role, action)) throw fail(409, { message: 'Your role changed while this was being saved; it was not applied.' })
  const membership = await Membership.findByPk(membershipId, { transaction, lock: transaction.LOCK.UPDATE })
  if (!membership || membership.newsroomId !== actor.newsroomId) throw fail(404)
  return membership
}

/** A newsroom always keeps one admin: refuse a change that would leave none (under the newsroom's row lock). */
async function assertAnotherAdmin(newsroomId: string, membershipId: string, transaction: Transaction) {
  const { Membership } = useDb().models
  const admins = await Membership.findAll({ where: { newsroomId, role: 'admin' }, transaction })
  if (!admins.some(a => a.id !== membershipId)) {
    throw fail(409, { message: 'A newsroom needs at least one admin. Make someone else admin first.' })
  }
}

export async function changeRole(actor: Actor, membershipId: string, role: Role) {
  const { sequelize } = useDb()
  await sequelize.transaction(async (transaction) => {
    const membership = await lockMembership(actor, 'member.changeRole', membershipId, transaction)
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
  const { sequelize } = useDb()
  await sequelize.transaction(async (transaction) => {
    const membership = await lockMembership(actor, 'member.remove', membershipId, transaction)
    if (membership.role === 'admin') await assertAnotherAdmin(actor.newsroomId, membershipId, transaction)
    await membership.destroy({ transaction })
    // Signed out everywhere, not only here: a removed member's open pages must stop at once.
    const sessionsEnded = await endSessionsOf(membership.userId as string, 'removed-from-newsroom', { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, actorId: actor.userId, action: 'member.removed',
      subjectType: 'user', subjectId: membership.userId as string, detail: { role: membership.role, sessionsEnded },
    }, transaction)
  })
}
