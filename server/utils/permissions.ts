import type { H3Event } from 'h3'
import { can } from '#shared/auth/permissions'
import type { Action } from '#shared/auth/permissions'
import { ROLE_LABELS } from '#shared/auth/roles'
import type { Role } from '#shared/auth/roles'

export interface Actor {
  userId: string
  name: string
  email: string
  newsroomId: string
  role: Role
}

/** The signed-in user from the session, or 401. */
export async function requireSignedIn(event: H3Event) {
  const session = await getUserSession(event)
  if (!session.user) throw fail(401)
  return session.user
}

/**
 * The one permission check every route uses. The role is read from the database on every
 * call, so a role change or removal takes effect at once. A newsroom the user does not
 * belong to answers 404, exactly like a record that does not exist.
 */
export async function requirePermission(
  event: H3Event,
  action: Action,
  resource: { newsroomId: string, ownerId?: string | null },
): Promise<Actor> {
  const user = await requireSignedIn(event)
  const membership = await useDb().models.Membership.findOne({ where: { userId: user.id, newsroomId: resource.newsroomId } })
  if (!membership) throw fail(404)
  if (!can(membership.role, action, resource.ownerId === user.id)) throw fail(403, { message: `Your role in this newsroom (${ROLE_LABELS[membership.role]}) does not allow this.` })
  return { userId: user.id, name: user.name, email: user.email, newsroomId: resource.newsroomId, role: membership.role }
}

/** The newsroom of a member who belongs to exactly one; others must name it (400). */
export async function onlyNewsroomOf(userId: string): Promise<string> {
  const memberships = await useDb().models.Membership.findAll({ where: { userId }, attributes: ['newsroomId'] })
  if (memberships.length !== 1) {
    throw fail(400, [{ path: 'newsroomId', message: 'You belong to several newsrooms (or none): add ?newsroomId= to say which.' }])
  }
  return memberships[0]!.newsroomId as string
}
