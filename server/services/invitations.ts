import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { Role } from '#shared/auth/roles'
import { ROLE_LABELS } from '#shared/auth/roles'
import type { InvitationDTO, InvitationPeekDTO, UserDTO } from '#shared/types/dto'
// Imported, not auto-imported: `npm run newsroom:create` stores its invitation here too.
import { recordAudit } from '../utils/audit'
import { useDb } from '../utils/db'
import type { Actor } from '../utils/permissions'
import { confirmPassword } from './sign-in'
import { createToken, hashToken } from '../utils/tokens'

const VALID_DAYS = 7

/**
 * Stores an invitation, replacing any pending one for the same address, with its audit event;
 * returns it with the token its link carries (only the hash is kept).
 */
export async function storeInvitation(invite: { newsroomId: string, email: string, role: Role, invitedBy: string }, transaction: Transaction) {
  const { sequelize, models } = useDb()
  const token = createToken()
  const expiresAt = new Date(Date.now() + VALID_DAYS * 24 * 3600 * 1000)
  // A newer invitation replaces any pending one for the same address; two sent at the same moment
  // queue on this lock, so exactly one stays pending (the index invitations_one_pending holds it).
  await sequelize.query('SELECT pg_advisory_xact_lock(hashtext(:key))', { replacements: { key: `invitation:${invite.newsroomId}:${invite.email}` }, transaction })
  await models.Invitation.update({ revokedAt: new Date() }, {
    where: { newsroomId: invite.newsroomId, email: invite.email, acceptedAt: null, revokedAt: null }, transaction,
  })
  const invitation = await models.Invitation.create({
    newsroomId: invite.newsroomId, email: invite.email, role: invite.role, tokenHash: hashToken(token),
    invitedBy: invite.invitedBy, expiresAt, acceptedAt: null, revokedAt: null,
  }, { transaction })
  await recordAudit({
    newsroomId: invite.newsroomId, actorId: invite.invitedBy, action: 'member.invited',
    subjectType: 'invitation', subjectId: invitation.id, detail: { email: invite.email, role: invite.role },
  }, transaction)
  return { invitation, token }
}

/** Creates an invitation and e-mails its link; only the token's hash is stored. */
export async function createInvitation(actor: Actor, email: string, role: Role): Promise<InvitationDTO> {
  const { sequelize, models } = useDb()
  const existing = await models.Membership.findOne({
    where: { newsroomId: actor.newsroomId },
    include: [{ model: models.User, as: 'user', where: { email }, required: true }],
  })
  if (existing) throw fail(409, [{ path: 'email', message: 'This person is already a member.' }])

  const { invitation, token } = await sequelize.transaction(transaction =>
    storeInvitation({ newsroomId: actor.newsroomId, email, role, invitedBy: actor.userId }, transaction))

  const newsroom = await models.Newsroom.findByPk(actor.newsroomId)
  const link = `${useRuntimeConfig().publicUrl}/join/${token}`
  await sendMail({
    to: email,
    subject: `${actor.name} invites you to ${newsroom?.name} on Mantissa`,
    text: [
      `${actor.name} has invited you to join ${newsroom?.name} on Mantissa as ${ROLE_LABELS[role].toLowerCase()}.`,
      '',
      `Open this link to choose your name and password (it works once, until ${invitation.expiresAt.toUTCString()}):`,
      link,
      '',
      'If you did not expect this, ignore this message.',
    ].join('\n'),
  })
  return toDTO(invitation, actor.name)
}

function toDTO(invitation: InstanceType<ReturnType<typeof useDb>['models']['Invitation']>, invitedBy: string): InvitationDTO {
  return {
    id: invitation.id, email: invitation.email, role: invitation.role, invitedBy,
    expiresAt: invitation.expiresAt.toISOString(), createdAt: invitation.createdAt.toISOString(),
  }
}

export async function listPendingInvitations(newsroomId: string): Promise<InvitationDTO[]> {
  const { Invitation, User } = useDb().models
  const rows = await Invitation.findAll({
    where: { newsroomId, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    include: [{ model: User, as: 'inviter' }],
    order: [['createdAt', 'DESC']],
  })
  return rows.map(row => toDTO(row, row.inviter?.name ?? ''))
}

export async function revokeInvitation(actor: Actor, invitationId: string) {
  const { Invitation } = useDb().models
  const invitation = await Invitation.findOne({ where: { id: invitationId, newsroomId: actor.newsroomId, acceptedAt: null, revokedAt: null } })
  if (!invitation) throw fail(404)
  await useDb().sequelize.transaction(async (transaction) => {
    await invitation.update({ revokedAt: new Date() }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, actorId: actor.userId, action: 'member.invitation-revoked',
      subjectType: 'invitation', subjectId: invitation.id, detail: { email: invitation.email, role: invitation.role },
    }, transaction)
  })
}

/** The open invitation behind a token; 404 when unknown, used, revoked or expired. */
async function findOpenInvitation(token: string) {
  const { Invitation, Newsroom } = useDb().models
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashToken(token), acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    include: [{ model: Newsroom, as: 'newsroom' }],
  })
  if (!invitation) throw fail(404, { message: 'This invitation link has expired, was already used, or was withdrawn.' })
  return invitation
}

export async function peekInvitation(token: string): Promise<InvitationPeekDTO> {
  const invitation = await findOpenInvitation(token)
  const existing = await useDb().models.User.count({ where: { email: invitation.email } })
  return {
    newsroomName: invitation.newsroom?.name ?? '',
    email: invitation.email,
    role: invitation.role,
    existingAccount: existing > 0,
    expiresAt: invitation.expiresAt.toISOString(),
  }
}

/**
 * Accepts an invitation: a new person chooses a name and password; someone who already has
 * an account must give that account's password, so a leaked link cannot take it over.
 */
export async function acceptInvitation(token: string, name: string, password: string, ip: string): Promise<{ user: UserDTO, mayOpenSession: boolean }> {
  const { sequelize, models } = useDb()
  const invitation = await findOpenInvitation(token)
  const existing = await models.User.findOne({ where: { email: invitation.email } })
  if (existing) await confirmPassword(existing.email, password, ip, 'password', 'You already have an account: enter its password to join.')
  const passwordHash = existing ? existing.passwordHash : await hashPassword(password)
  return sequelize.transaction(async (transaction) => {
    // Claim the invitation first, so two simultaneous clicks cannot both join.
    const [claimed] = await models.Invitation.update({ acceptedAt: new Date() }, {
      where: { id: invitation.id, acceptedAt: null, revokedAt: null }, transaction,
    })
    if (claimed !== 1) throw fail(404)
    const user = existing ?? await models.User.create({ email: invitation.email, name, passwordHash }, { transaction })
    await models.Membership.create({ newsroomId: invitation.newsroomId, userId: user.id, role: invitation.role }, { transaction })
    await recordAudit({
      newsroomId: invitation.newsroomId as string, actorId: user.id, action: 'member.joined',
      subjectType: 'user', subjectId: user.id, detail: { role: invitation.role, invitationId: invitation.id },
    }, transaction)
    // An account with two-factor sign-in joins, but signs in through the sign-in page with its code.
    return { user: { id: user.id, name: user.name, email: user.email }, mayOpenSession: !existing?.totpSecret }
  })
}
