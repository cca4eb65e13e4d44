import { randomInt } from 'node:crypto'
import { Op } from 'sequelize'
import { generateSecret, generateURI, verify } from 'otplib'
import { encode } from 'uqr'
import type { TwoFactorSetupDTO } from '#shared/types/dto'
import { recordAccountEvent } from './audit'
import { endSessionsOf } from './sessions'
import type { SignedIn } from './sessions'

type UserRow = InstanceType<ReturnType<typeof useDb>['models']['User']>

const ISSUER = 'Mantissa'
const RECOVERY_CODES = 10
// No 0/o, 1/l/i: the codes are read off paper and typed.
const RECOVERY_ALPHABET = 'abcdefghjkmnpqrstuvwxyz23456789'
/** One time step either side of now: an authenticator whose clock is up to 30 s off still works (RFC 6238, 5.2). */
const TOLERANCE_SECONDS = 30

/** A recovery code as typed: spaces, dashes and case do not matter. */
function normalizeRecoveryCode(code: string) {
  return code.toLowerCase().replace(/[\s-]/g, '')
}

function newRecoveryCodes(): string[] {
  return Array.from({ length: RECOVERY_CODES }, () => {
    const chars = Array.from({ length: 10 }, () => RECOVERY_ALPHABET[randomInt(RECOVERY_ALPHABET.length)])
    return `${chars.slice(0, 5).join('')}-${chars.slice(5).join('')}`
  })
}

/** The time step of a right 6-digit code for `secret`, or null (SHA-1, 30 s, 6 digits: what authenticator apps assume). */
export async function codeStep(secret: string, code: string, afterStep?: number): Promise<number | null> {
  if (!/^\d{6}$/.test(code)) return null
  const result = await verify({ secret, token: code, epochTolerance: TOLERANCE_SECONDS, ...(afterStep !== undefined ? { afterTimeStep: afterStep } : {}) })
  return result.valid && 'timeStep' in result ? result.timeStep : null
}

async function replaceRecoveryCodes(userId: string, transaction?: import('sequelize').Transaction): Promise<string[]> {
  const { RecoveryCode } = useDb().models
  const codes = newRecoveryCodes()
  await RecoveryCode.destroy({ where: { userId }, transaction })
  await RecoveryCode.bulkCreate(codes.map(code => ({ userId, codeHash: hashToken(normalizeRecoveryCode(code)) })), { transaction })
  return codes
}

/**
 * A code at sign-in: an authenticator code not used before (its time step must be later than the
 * last one accepted, written in the same statement, so a code works once even when sent twice at
 * once), or an unused recovery code, which is then spent.
 */
export async function checkSecondFactor(user: UserRow, code: string): Promise<boolean> {
  const { User, RecoveryCode } = useDb().models
  const trimmed = code.trim()
  if (/^\d{6}$/.test(trimmed)) {
    const last = user.totpLastStep === null ? undefined : Number(user.totpLastStep)
    const step = await codeStep(user.totpSecret!, trimmed, last)
    if (step === null) return false
    const [claimed] = await User.update({ totpLastStep: String(step) }, {
      where: { id: user.id, [Op.or]: [{ totpLastStep: null }, { totpLastStep: { [Op.lt]: step } }] },
    })
    return claimed === 1
  }
  const [spent] = await RecoveryCode.update({ usedAt: new Date() }, {
    where: { userId: user.id, codeHash: hashToken(normalizeRecoveryCode(trimmed)), usedAt: null },
  })
  if (spent !== 1) return false
  const left = await RecoveryCode.count({ where: { userId: user.id, usedAt: null } })
  await recordAccountEvent(user.id, 'account.recovery-code-used', { left })
  return true
}

/** Starts (or restarts) setting up an authenticator: a new secret, kept pending until a code proves the app has it. */
export async function startTwoFactorSetup(userId: string, email: string): Promise<TwoFactorSetupDTO> {
  const secret = generateSecret()
  await useDb().models.User.update({ totpPendingSecret: secret }, { where: { id: userId } })
  const uri = generateURI({ issuer: ISSUER, label: email, secret })
  return { secret, uri, qr: encode(uri, { ecc: 'M', border: 2 }).data }
}

/**
 * Turns two-factor sign-in on once a code from the app matches the pending secret. The session that
 * did it counts as signed in with both factors; the person's other sessions, opened with the
 * password alone, end. Returns the recovery codes, shown this once.
 */
export async function confirmTwoFactor(signedIn: SignedIn, code: string): Promise<{ recoveryCodes: string[], otherSessionsEnded: number }> {
  const { sequelize, models } = useDb()
  const user = await models.User.findByPk(signedIn.user.id)
  if (!user?.totpPendingSecret) throw fail(400, [{ path: 'code', message: 'Start the setup first: there is no authenticator waiting to be confirmed.' }])
  const step = await codeStep(user.totpPendingSecret, code.trim())
  if (step === null) throw fail(400, [{ path: 'code', message: 'That code does not match. Check the app shows Mantissa and try the newest code.' }])
  return sequelize.transaction(async (transaction) => {
    await user.update({ totpSecret: user.totpPendingSecret, totpPendingSecret: null, totpLastStep: String(step) }, { transaction })
    const recoveryCodes = await replaceRecoveryCodes(user.id, transaction)
    await signedIn.session.update({ secondFactor: true }, { transaction })
    const otherSessionsEnded = await endSessionsOf(user.id, 'two-factor-enabled', { keepId: signedIn.session.id, transaction })
    await recordAccountEvent(user.id, 'account.two-factor-enabled', { otherSessionsEnded }, { transaction })
    return { recoveryCodes, otherSessionsEnded }
  })
}

/** New recovery codes (the old ones stop working), for a person who proves the app with a code. */
export async function regenerateRecoveryCodes(userId: string, code: string): Promise<{ recoveryCodes: string[] }> {
  const { sequelize, models } = useDb()
  const user = await models.User.findByPk(userId)
  if (!user?.totpSecret) throw fail(409, { message: 'Two-factor sign-in is not on for your account.' })
  if ((await codeStep(user.totpSecret, code.trim())) === null) throw fail(400, [{ path: 'code', message: 'That code does not match the newest one in your app.' }])
  return sequelize.transaction(async (transaction) => {
    const recoveryCodes = await replaceRecoveryCodes(userId, transaction)
    await recordAccountEvent(userId, 'account.recovery-codes-replaced', {}, { transaction })
    return { recoveryCodes }
  })
}

/** The newsrooms that ask for two-factor sign-in, of those the person belongs to. */
export async function newsroomsRequiringTwoFactor(userId: string): Promise<string[]> {
  const { Membership, Newsroom } = useDb().models
  const rows = await Membership.findAll({
    where: { userId },
    include: [{ model: Newsroom, as: 'newsroom', where: { requireTwoFactor: true }, required: true }],
  })
  return rows.map(m => m.newsroom?.name ?? '')
}

/** Turns two-factor sign-in off (nothing to do when it is off), unless a newsroom of the person requires it. */
export async function disableTwoFactor(userId: string) {
  const { sequelize, models } = useDb()
  const requiring = await newsroomsRequiringTwoFactor(userId)
  if (requiring.length) throw fail(409, { message: `${requiring.join(', ')} asks every member to use two-factor sign-in, so it stays on.` })
  const user = await models.User.findByPk(userId)
  if (!user?.totpSecret && !user?.totpPendingSecret) return
  await sequelize.transaction(async (transaction) => {
    await user.update({ totpSecret: null, totpPendingSecret: null, totpLastStep: null }, { transaction })
    await models.RecoveryCode.destroy({ where: { userId }, transaction })
    await recordAccountEvent(userId, 'account.two-factor-disabled', {}, { transaction })
  })
}
