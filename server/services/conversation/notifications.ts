import { Op, QueryTypes } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { NotificationDTO, NotificationKind, NotificationPageDTO } from '#shared/types/conversation'
import { investigationPath } from '#shared/conversation/anchor'
import { oneLine } from '#shared/schemas/text'

const EXCERPT_MAX = 240

export interface NotificationEvent {
  kind: NotificationKind
  newsroomId: string
  investigationId: string
  actorId: string
  /** subjectAnchor() of the block, review or claim; '' for the investigation as a whole. */
  anchor?: string
  threadId?: string | null
  excerpt?: string
}

/**
 * Writes one in-app notification per recipient, in the change's own transaction, so a change and
 * its notices are kept or lost together. Only current members of the newsroom get one, never the
 * person who acted. Answers the ids of those notified.
 */
export async function recordNotifications(recipients: (string | null | undefined)[], event: NotificationEvent, transaction?: Transaction): Promise<string[]> {
  const wanted = [...new Set(recipients.filter((id): id is string => Boolean(id) && id !== event.actorId))]
  if (!wanted.length) return []
  const { models } = useDb()
  const members = await models.Membership.findAll({ where: { newsroomId: event.newsroomId, userId: { [Op.in]: wanted } }, attributes: ['userId'], transaction })
  const ids = members.map(m => m.userId as string)
  const excerpt = oneLine(event.excerpt ?? '')
  await models.Notification.bulkCreate(ids.map(userId => ({
    userId, newsroomId: event.newsroomId, investigationId: event.investigationId, kind: event.kind, actorId: event.actorId,
    anchor: event.anchor ?? '', threadId: event.threadId ?? null,
    excerpt: excerpt.length > EXCERPT_MAX ? `${excerpt.slice(0, EXCERPT_MAX - 1)}…` : excerpt,
  })), { transaction })
  return ids
}

interface Row {
  id: string
  kind: NotificationKind
  actor: string | null
  investigation_id: string
  title: string
  anchor: string
  excerpt: string
  created_at: Date
  read_at: Date | null
}

// Only notifications of newsrooms the person still belongs to: leaving one takes its notices away.
const MEMBER = 'JOIN memberships m ON m.user_id = n.user_id AND m.newsroom_id = n.newsroom_id'

async function unreadCount(userId: string): Promise<number> {
  const [row] = await useDb().sequelize.query<{ count: string }>(`SELECT count(*) AS count FROM notifications n ${MEMBER} WHERE n.user_id = :userId AND n.read_at IS NULL`, { replacements: { userId }, type: QueryTypes.SELECT })
  return Number(row?.count ?? 0)
}

/** The signed-in member's notifications, newest first, a page at a time, with the count of unread ones. */
export async function listNotifications(userId: string, query: { before?: string, limit: number, unread?: 'true' | 'false' }): Promise<NotificationPageDTO> {
  const rows = query.limit === 0
    ? []
    : await useDb().sequelize.query<Row>(`
      SELECT n.id, n.kind, u.name AS actor, n.investigation_id, i.title, n.anchor, n.excerpt, n.created_at, n.read_at
      FROM notifications n ${MEMBER} JOIN investigations i ON i.id = n.investigation_id LEFT JOIN users u ON u.id = n.actor_id
      WHERE n.user_id = :userId ${query.before ? 'AND n.id < :before' : ''} ${query.unread === 'true' ? 'AND n.read_at IS NULL' : ''}
      ORDER BY n.id DESC LIMIT :limit`, { replacements: { userId, before: query.before ?? null, limit: query.limit + 1 }, type: QueryTypes.SELECT })
  const page = rows.slice(0, query.limit)
  return {
    unread: await unreadCount(userId),
    items: page.map(row => notificationDTO(row)),
    next: rows.length > query.limit ? page.at(-1)!.id : null,
  }
}

function notificationDTO(row: Row): NotificationDTO {
  return {
    id: String(row.id), kind: row.kind, actor: row.actor ?? 'a former member',
    investigationId: row.investigation_id, investigationTitle: row.title,
    path: investigationPath(row.investigation_id, row.anchor), excerpt: row.excerpt,
    at: new Date(row.created_at).toISOString(), read: Boolean(row.read_at),
  }
}

/** Marks the member's own notifications read (some, or all); ids of anyone else's change nothing. */
export async function markNotificationsRead(userId: string, input: { ids: string[] } | { all: true }) {
  await useDb().models.Notification.update({ readAt: new Date() }, {
    where: { userId, readAt: null, ...('ids' in input ? { id: { [Op.in]: input.ids } } : {}) },
  })
  return { unread: await unreadCount(userId) }
}
