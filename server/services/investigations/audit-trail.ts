import { Op } from 'sequelize'
import type { AuditEventDTO } from '#shared/types/investigation'
import type { Investigation } from '../../models'
import { liveBlocks, userNames } from './catalog'

const NEWSROOM_ACTIONS = ['member.role-changed', 'member.removed', 'member.joined']

/**
 * The investigation's trail: its own events, the imports of the datasets its blocks use, and the
 * newsroom's role changes, oldest first. Read-only: the table refuses updates and deletes.
 */
export async function auditTrail(investigation: Investigation): Promise<AuditEventDTO[]> {
  const datasetIds = [...new Set((await liveBlocks(investigation.id)).map(b => b.settings?.datasetId).filter((id): id is string => Boolean(id)))]
  const events = await useDb().models.AuditEvent.findAll({
    where: {
      newsroomId: investigation.newsroomId,
      [Op.or]: [
        { investigationId: investigation.id },
        { action: 'dataset.imported', subjectId: { [Op.in]: datasetIds } },
        { action: { [Op.in]: NEWSROOM_ACTIONS } },
      ],
    },
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
    limit: 5000,
  })
  const names = await userNames(events.map(e => e.actorId))
  return events.map(event => ({
    id: String(event.id), action: event.action, actor: event.actorId ? names.get(event.actorId) ?? 'a former member' : null,
    subjectType: event.subjectType, subjectId: event.subjectId, detail: event.detail, at: event.createdAt.toISOString(),
  }))
}
