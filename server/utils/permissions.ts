import type { H3Event } from 'h3'
import { can } from '#shared/auth/permissions'
import type { Action } from '#shared/auth/permissions'
import { ROLE_LABELS } from '#shared/auth/roles'
import type { Role } from '#shared/auth/roles'
import { currentSession } from '../services/account/sessions'

export interface Actor {
  userId: string
  name: string
  email: string
  newsroomId: string
  role: Role
  /** This session was opened with the second factor (or turned it on). */
  secondFactor: boolean
}

/** The open session behind the request's cookie (its user and its `sessions` row), or 401. */
export async function requireSession(event: H3Event) {
  const signedIn = await currentSession(event)
  if (!signedIn) {
    // A cookie whose session was ended goes, so the browser stops sending it.
    if ((await getUserSession(event)).user) await clearUserSession(event)
    throw fail(401)
  }
  return signedIn
}

/** The signed-in user from the session, or 401. */
export async function requireSignedIn(event: H3Event) {
  return (await requireSession(event)).user
}

/**
 * The one permission check every route uses. The role is read from the database on every
 * call, so a role change or removal takes effect at once, and so does the newsroom's demand for
 * two-factor sign-in (a session opened without the second factor gets 403). A newsroom the user does not
 * belong to answers 404, exactly like a record that does not exist.
 */
export async function requirePermission(
  event: H3Event,
  action: Action,
  resource: { newsroomId: string, ownerId?: string | null },
): Promise<Actor> {
  const { user, session } = await requireSession(event)
  const { Membership, Newsroom } = useDb().models
  const membership = await Membership.findOne({
    where: { userId: user.id, newsroomId: resource.newsroomId },
    include: [{ model: Newsroom, as: 'newsroom', attributes: ['requireTwoFactor'] }],
  })
  if (!membership) throw fail(404)
  if (membership.newsroom?.requireTwoFactor && !session.secondFactor) {
    throw fail(403, { reason: 'two-factor-required', message: 'This newsroom asks every member to sign in with a code from an authenticator app. Turn it on in your account, then sign in again.' })
  }
  if (!can(membership.role, action, resource.ownerId === user.id)) throw fail(403, { message: `Your role in this newsroom (${ROLE_LABELS[membership.role]}) does not allow this.` })
  return { userId: user.id, name: user.name, email: user.email, newsroomId: resource.newsroomId, role: membership.role, secondFactor: session.secondFactor }
}

/** The newsroom of a member who belongs to exactly one; others must name it (400). */
export async function onlyNewsroomOf(userId: string): Promise<string> {
  const memberships = await useDb().models.Membership.findAll({ where: { userId }, attributes: ['newsroomId'] })
  if (memberships.length !== 1) {
    throw fail(400, [{ path: 'newsroomId', message: 'You belong to several newsrooms (or none): add ?newsroomId= to say which.' }])
  }
  return memberships[0]!.newsroomId as string
}
