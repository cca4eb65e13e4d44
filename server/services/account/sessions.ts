import type { H3Event } from 'h3'
import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { SessionDTO, UserDTO } from '#shared/types/dto'
import { UnsealedCookies } from './unsealed-cookies'

type SessionRow = InstanceType<ReturnType<typeof useDb>['models']['Session']>

export interface SignedIn {
  user: UserDTO
  session: SessionRow
}

declare module 'h3' {
  interface H3EventContext {
    signedIn?: SignedIn | null
  }
}

/** How often "last seen" is written: often enough for the list of sessions, rarely enough to stay off every request's path. */
const TOUCH_EVERY_MS = 5 * 60 * 1000

/**
 * Opens a session: a row in `sessions`, and the sealed cookie carrying the row's random key
 * (only its hash is stored). Replaces whatever session the browser had.
 */
export async function openSession(event: H3Event, user: UserDTO, secondFactor: boolean) {
  const token = createToken()
  const maxAgeSeconds = Number(useRuntimeConfig().session.maxAge)
  await useDb().models.Session.create({
    userId: user.id,
    tokenHash: hashToken(token),
    secondFactor,
    ip: getRequestIP(event) ?? 'unknown',
    userAgent: (getRequestHeader(event, 'user-agent') ?? '').slice(0, 300),
    expiresAt: new Date(Date.now() + maxAgeSeconds * 1000),
  })
  await replaceUserSession(event, { user, secure: { token } })
  event.context.signedIn = undefined
}

/**
 * The session behind the request's cookie when it is still open, else null. This is the one place
 * a cookie is checked against the `sessions` table: `requireSignedIn` and the client's session
 * fetch both come here, so a session ended anywhere answers 401 everywhere.
 */
export async function currentSession(event: H3Event): Promise<SignedIn | null> {
  if (event.context.signedIn !== undefined) return event.context.signedIn
  const data = await cookieSession(event)
  const token = data.secure?.token
  let found: SignedIn | null = null
  if (data.user && token) {
    const session = await useDb().models.Session.findOne({
      where: { tokenHash: hashToken(token), endedAt: null, expiresAt: { [Op.gt]: new Date() } },
    })
    if (session && session.userId === data.user.id) {
      found = { user: data.user, session }
      if (Date.now() - session.lastSeenAt.getTime() > TOUCH_EVERY_MS) await session.update({ lastSeenAt: new Date() })
    }
  }
  event.context.signedIn = found
  return found
}

let unsealed: UnsealedCookies | undefined

/**
 * nuxt-auth-utils' getUserSession, with the cookie unsealed once per server (unsealed-cookies.ts):
 * h3 reads a session it finds in event.context.sessions instead of unsealing the cookie again.
 */
async function cookieSession(event: H3Event) {
  const config = useRuntimeConfig().session
  const name = String(config.name ?? 'nuxt-session')
  unsealed ??= new UnsealedCookies(Number(config.maxAge) * 1000)
  const sealed = getCookie(event, name)
  const sessions = (event.context.sessions ??= Object.create(null) as NonNullable<H3Event['context']['sessions']>)
  const known = sealed && !sessions[name] ? unsealed.get(sealed) : undefined
  if (known) sessions[name] = known
  const data = await getUserSession(event)
  if (sealed && !known && sessions[name]) unsealed.remember(sealed, sessions[name])
  return data
}

/** Ends the request's own session (sign out) and clears its cookie. */
export async function endCurrentSession(event: H3Event) {
  const signedIn = await currentSession(event)
  if (signedIn) await signedIn.session.update({ endedAt: new Date(), endedReason: 'signed-out' })
  await clearUserSession(event)
  event.context.signedIn = null
}

/** Ends every open session of a person, but `keepId`; the number ended. */
export async function endSessionsOf(userId: string, reason: string, options: { keepId?: string, transaction?: Transaction } = {}) {
  const [ended] = await useDb().models.Session.update({ endedAt: new Date(), endedReason: reason }, {
    where: { userId, endedAt: null, ...(options.keepId ? { id: { [Op.ne]: options.keepId } } : {}) },
    transaction: options.transaction,
  })
  return ended
}

/** Ends one of the person's own sessions; 404 when it is not theirs or already ended. */
export async function endOwnSession(userId: string, sessionId: string) {
  const [ended] = await useDb().models.Session.update({ endedAt: new Date(), endedReason: 'ended-from-account' }, {
    where: { id: sessionId, userId, endedAt: null },
  })
  if (ended !== 1) throw fail(404)
}

/** The person's open sessions, newest first, the caller's own marked. */
export async function listSessions(userId: string, currentId: string): Promise<SessionDTO[]> {
  const rows = await useDb().models.Session.findAll({
    where: { userId, endedAt: null, expiresAt: { [Op.gt]: new Date() } },
    order: [['createdAt', 'DESC']],
  })
  return rows.map(row => ({
    id: row.id,
    createdAt: row.createdAt.toISOString(),
    lastSeenAt: row.lastSeenAt.toISOString(),
    ip: row.ip,
    userAgent: row.userAgent,
    secondFactor: row.secondFactor,
    current: row.id === currentId,
  }))
}
