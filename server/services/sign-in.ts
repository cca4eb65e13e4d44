import { Op } from 'sequelize'
import type { MeDTO, UserDTO } from '#shared/types/dto'
import { recordAccountEvent } from './account/audit'
import { admitAttempt, settle } from './account/throttle'
import type { Admission, ThrottleRule } from './account/throttle'
import { passwordRules, secondFactorRule } from './account/sign-in-rules'
import { checkSecondFactor } from './account/two-factor'

type UserRow = InstanceType<ReturnType<typeof useDb>['models']['User']>

const KNOWN_ADDRESS_DAYS = 90
let dummyHash: Promise<string> | undefined

/**
 * An unknown address costs the same hashing as a known one, so the time of the answer does not
 * tell which addresses have accounts.
 */
function hashForTiming(): Promise<string> {
  dummyHash ??= hashPassword(createToken())
  return dummyHash
}

/** The 429 of a refused attempt: when to come back, and the way out that needs no waiting. */
function tooManyAttempts(admission: Extract<Admission, { admitted: false }>) {
  const seconds = Math.max(1, Math.ceil((admission.retryAt.getTime() - Date.now()) / 1000))
  const wait = seconds < 90 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`
  return fail(429, {
    message: `Too many wrong attempts. Try again in ${wait}, or reset your password by e-mail.`,
    retryAt: admission.retryAt.toISOString(),
    retryAfterSeconds: seconds,
    resetPath: '/forgot-password',
  })
}

async function isKnownAddress(email: string, ip: string): Promise<boolean> {
  const { SignInAttempt } = useDb().models
  const since = new Date(Date.now() - KNOWN_ADDRESS_DAYS * 24 * 3600 * 1000)
  return (await SignInAttempt.count({ where: { email, ip, succeeded: true, createdAt: { [Op.gte]: since } } })) > 0
}

/** Records in the trail the waits this failed attempt started, on the accounts they hold back. */
async function recordDelays(user: UserRow | null, rules: ThrottleRule[], ip: string) {
  if (!user) return
  for (const rule of rules) {
    await recordAccountEvent(user.id, 'account.sign-in-delayed', {
      scope: rule.key.split(':')[0], ip, failures: rule.free,
    }, { actorId: null })
  }
}

/**
 * Checks an e-mail and password under the sign-in throttle (the attempt is counted before the
 * check); 401 when they do not match, 429 while a key waits. Used by sign-in and by an existing
 * member accepting an invitation.
 */
export async function checkPassword(email: string, password: string, ip: string): Promise<UserRow> {
  const { User, SignInAttempt } = useDb().models
  const rules = passwordRules(ip, email, await isKnownAddress(email, ip))
  const admission = await admitAttempt(rules)
  if (!admission.admitted) throw tooManyAttempts(admission)
  let ok = false
  let user: UserRow | null = null
  try {
    user = await User.findOne({ where: { email } })
    ok = await verifyPassword(user?.passwordHash ?? await hashForTiming(), password) && !!user
  }
  finally {
    const delayed = await settle(admission, ok)
    await SignInAttempt.create({ email, ip, succeeded: ok })
    if (!ok) await recordDelays(user, delayed, ip)
  }
  if (!ok) throw fail(401, { message: 'E-mail or password does not match.' })
  return user!
}

/**
 * A signed-in person (or an account joining a newsroom) proves it is them: the password under the
 * sign-in throttle, a wrong one a field error on `field` rather than a 401, which would read as
 * "signed out".
 */
export async function confirmPassword(email: string, password: string, ip: string, field: string, message: string) {
  try {
    await checkPassword(email, password, ip)
  }
  catch (error) {
    if ((error as { statusCode?: number }).statusCode !== 401) throw error
    throw fail(400, [{ path: field, message }])
  }
}

/**
 * Sign-in: the password, then for an account with two-factor sign-in the code from the
 * authenticator (or a recovery code). Without a code such an account answers 401 with
 * `secondFactor: 'required'`, so a form can ask for it and send both again.
 */
export async function signIn(email: string, password: string, code: string | undefined, ip: string): Promise<{ user: UserDTO, secondFactor: boolean }> {
  const user = await checkPassword(email, password, ip)
  if (user.totpSecret) {
    if (!code) throw fail(401, { secondFactor: 'required', message: 'Enter the 6-digit code from your authenticator app, or one of your recovery codes.' })
    const admission = await admitAttempt([secondFactorRule(user.id)])
    if (!admission.admitted) throw tooManyAttempts(admission)
    let right = false
    try {
      right = await checkSecondFactor(user, code)
    }
    finally {
      const delayed = await settle(admission, right)
      if (!right) await recordDelays(user, delayed, ip)
    }
    if (!right) throw fail(401, { secondFactor: 'wrong', message: 'That code is not right (or was already used). Codes change every 30 seconds.' })
  }
  return { user: { id: user.id, name: user.name, email: user.email }, secondFactor: !!user.totpSecret }
}

/** The signed-in user and the newsrooms they belong to, with their role in each. */
export async function loadMe(userId: string, sessionSecondFactor: boolean): Promise<MeDTO> {
  const { User, Membership, Newsroom, RecoveryCode } = useDb().models
  const user = await User.findByPk(userId, {
    include: [{ model: Membership, as: 'memberships', include: [{ model: Newsroom, as: 'newsroom' }] }],
  })
  if (!user) throw fail(401)
  const memberships = (user.get('memberships') as InstanceType<typeof Membership>[])
    .map(m => ({ newsroomId: m.newsroomId as string, newsroomName: m.newsroom?.name ?? '', role: m.role, requireTwoFactor: !!m.newsroom?.requireTwoFactor }))
    .sort((a, b) => a.newsroomName.localeCompare(b.newsroomName))
  const recoveryCodesLeft = user.totpSecret ? await RecoveryCode.count({ where: { userId, usedAt: null } }) : 0
  return {
    user: { id: user.id, name: user.name, email: user.email },
    memberships,
    notifyByEmail: user.notifyByEmail,
    emailMentions: user.emailMentions,
    twoFactor: { enabled: !!user.totpSecret, thisSession: sessionSecondFactor, recoveryCodesLeft },
  }
}

export async function updatePreferences(userId: string, preferences: { notifyByEmail?: boolean, emailMentions?: boolean }) {
  await useDb().models.User.update(preferences, { where: { id: userId } })
  const user = await useDb().models.User.findByPk(userId, { attributes: ['notifyByEmail', 'emailMentions'] })
  return { notifyByEmail: Boolean(user?.notifyByEmail), emailMentions: Boolean(user?.emailMentions) }
}
