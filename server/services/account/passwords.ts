import { Op } from 'sequelize'
import { confirmPassword } from '../sign-in'
import { recordAccountEvent } from './audit'
import { endSessionsOf } from './sessions'
import type { SignedIn } from './sessions'
import { forgiveAccount } from './throttle'

const RESET_VALID_MINUTES = 60
/** Reset mails per account per hour: more are not sent (the answer stays the same), so the form cannot flood an inbox. */
const RESET_MAILS_PER_HOUR = 3

/** Changes the password of a signed-in person who gives the current one; their other sessions end. */
export async function changePassword(signedIn: SignedIn, currentPassword: string, newPassword: string, ip: string) {
  const { sequelize, models } = useDb()
  await confirmPassword(signedIn.user.email, currentPassword, ip, 'currentPassword', 'This is not your current password.')
  const passwordHash = await hashPassword(newPassword)
  return sequelize.transaction(async (transaction) => {
    await models.User.update({ passwordHash }, { where: { id: signedIn.user.id }, transaction })
    const otherSessionsEnded = await endSessionsOf(signedIn.user.id, 'password-changed', { keepId: signedIn.session.id, transaction })
    await recordAccountEvent(signedIn.user.id, 'account.password-changed', { otherSessionsEnded }, { transaction })
    return { otherSessionsEnded }
  })
}

/**
 * Asks for a reset link. The answer is the same whether or not the address has an account, and
 * the work happens after it, so neither the words nor the time of the answer tell.
 */
export function requestPasswordReset(email: string, ip: string) {
  sendResetLink(email, ip).catch(error => console.error('[account] password reset mail failed:', (error as Error).message))
  return { message: 'If that address has a Mantissa account, a link to choose a new password is on its way. It works once, for an hour.' }
}

async function sendResetLink(email: string, ip: string) {
  const { sequelize, models } = useDb()
  const user = await models.User.findOne({ where: { email } })
  if (!user) return
  const recent = await models.PasswordReset.count({ where: { userId: user.id, createdAt: { [Op.gt]: new Date(Date.now() - 3600_000) } } })
  if (recent >= RESET_MAILS_PER_HOUR) return
  const token = createToken()
  const expiresAt = new Date(Date.now() + RESET_VALID_MINUTES * 60_000)
  await sequelize.transaction(async (transaction) => {
    // Only the newest link works.
    await models.PasswordReset.update({ expiresAt: new Date() }, { where: { userId: user.id, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction })
    await models.PasswordReset.create({ userId: user.id, tokenHash: hashToken(token), expiresAt }, { transaction })
    await recordAccountEvent(user.id, 'account.password-reset-requested', { ip }, { actorId: null, transaction })
  })
  await sendMail({
    to: user.email,
    subject: 'Choose a new Mantissa password',
    text: [
      `Someone (from the address ${ip}) asked to reset the password of your Mantissa account.`,
      '',
      `Open this link to choose a new one (it works once, until ${expiresAt.toUTCString()}):`,
      `${useRuntimeConfig().publicUrl}/reset-password/${token}`,
      '',
      'If it was not you, ignore this message: your password stays as it is.',
    ].join('\n'),
  })
}

async function findOpenReset(token: string) {
  const reset = await useDb().models.PasswordReset.findOne({
    where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
  })
  if (!reset) throw fail(404, { message: 'This reset link has expired or was already used. Ask for a new one.' })
  return reset
}

export async function peekPasswordReset(token: string) {
  const reset = await findOpenReset(token)
  const user = await useDb().models.User.findByPk(reset.userId as string)
  return { email: user?.email ?? '', expiresAt: reset.expiresAt.toISOString() }
}

/**
 * Sets a new password through a reset link: the link is spent in the same statement that checks it
 * (two clicks cannot both use it), every session of the account ends, and the sign-in waits on the
 * account are lifted. Two-factor sign-in, when on, stays on.
 */
export async function completePasswordReset(token: string, password: string) {
  const { sequelize, models } = useDb()
  const reset = await findOpenReset(token)
  const passwordHash = await hashPassword(password)
  const user = await sequelize.transaction(async (transaction) => {
    const [spent] = await models.PasswordReset.update({ usedAt: new Date() }, {
      where: { id: reset.id, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction,
    })
    if (spent !== 1) throw fail(404, { message: 'This reset link has expired or was already used. Ask for a new one.' })
    const user = await models.User.findByPk(reset.userId as string, { transaction })
    if (!user) throw fail(404)
    await user.update({ passwordHash }, { transaction })
    const sessionsEnded = await endSessionsOf(user.id, 'password-reset', { transaction })
    await recordAccountEvent(user.id, 'account.password-reset', { sessionsEnded }, { transaction })
    return user
  })
  await forgiveAccount(user.email)
  return { email: user.email }
}
