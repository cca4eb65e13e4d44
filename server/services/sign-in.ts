import { Op } from 'sequelize'
import type { MeDTO, UserDTO } from '#shared/types/dto'

const WINDOW_MS = 15 * 60 * 1000
const MAX_FAILURES_PER_EMAIL = 5
const MAX_FAILURES_PER_IP = 30

/** Kept in PostgreSQL so that every app server counts the same attempts. */
async function tooManyFailures(email: string, ip: string): Promise<boolean> {
  const { SignInAttempt } = useDb().models
  const since = new Date(Date.now() - WINDOW_MS)
  const [byEmail, byIp] = await Promise.all([
    SignInAttempt.count({ where: { email, succeeded: false, createdAt: { [Op.gte]: since } } }),
    SignInAttempt.count({ where: { ip, succeeded: false, createdAt: { [Op.gte]: since } } }),
  ])
  return byEmail >= MAX_FAILURES_PER_EMAIL || byIp >= MAX_FAILURES_PER_IP
}

/** Checks e-mail and password; 401 when they do not match, 429 after repeated failures. */
export async function signIn(email: string, password: string, ip: string): Promise<UserDTO> {
  const { User, SignInAttempt } = useDb().models
  if (await tooManyFailures(email, ip)) {
    throw fail(429, { retryAfterSeconds: WINDOW_MS / 1000 })
  }
  const user = await User.findOne({ where: { email } })
  const ok = user ? await verifyPassword(user.passwordHash, password) : false
  await SignInAttempt.create({ email, ip, succeeded: ok })
  if (!user || !ok) throw fail(401, { message: 'E-mail or password does not match.' })
  return { id: user.id, name: user.name, email: user.email }
}

/** The signed-in user and the newsrooms they belong to, with their role in each. */
export async function loadMe(userId: string): Promise<MeDTO> {
  const { User, Membership, Newsroom } = useDb().models
  const user = await User.findByPk(userId, {
    include: [{ model: Membership, as: 'memberships', include: [{ model: Newsroom, as: 'newsroom' }] }],
  })
  if (!user) throw fail(401)
  const memberships = (user.get('memberships') as InstanceType<typeof Membership>[])
    .map(m => ({ newsroomId: m.newsroomId as string, newsroomName: m.newsroom?.name ?? '', role: m.role }))
    .sort((a, b) => a.newsroomName.localeCompare(b.newsroomName))
  return { user: { id: user.id, name: user.name, email: user.email }, memberships, notifyByEmail: user.notifyByEmail }
}

export async function updatePreferences(userId: string, preferences: { notifyByEmail: boolean }) {
  await useDb().models.User.update(preferences, { where: { id: userId } })
  return preferences
}
