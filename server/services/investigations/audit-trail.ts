import { Op } from 'sequelize'
import type { WhereOptions } from 'sequelize'
import type { z } from 'zod'
import type { auditQuerySchema } from '#shared/schemas/investigation'
import type { AuditPageDTO } from '#shared/types/investigation'
import type { AuditEvent, Investigation } from '../../models'
import { liveBlocks, userNames } from './catalog'

const NEWSROOM_ACTIONS = ['member.role-changed', 'member.removed', 'member.joined', 'member.invited', 'member.invitation-revoked']
const DATASET_ACTIONS = ['dataset.imported', 'dataset.archived', 'dataset.deleted']

export type AuditQuery = z.output<typeof auditQuerySchema>

/**
 * One filter per query field; a new filter is one more entry here and one more field in
 * `auditQuerySchema`. `kind` is an action ("claim.verified") or the family before its dot ("claim").
 */
function filters(query: AuditQuery): WhereOptions<AuditEvent>[] {
  return [
    query.before ? { id: { [Op.lt]: query.before } } : {},
    query.actor ? { actorId: query.actor } : {},
    query.kind ? (query.kind.includes('.') ? { action: query.kind } : { action: { [Op.like]: `${query.kind}.%` } }) : {},
  ]
}

/**
 * A page of the investigation's trail, newest first: its own events, the imports of the datasets its
 * blocks use (and their archiving), and the newsroom's membership changes and invitations. `next` is the cursor of the page after this
 * one (null at the oldest event). Read-only: the table refuses updates and deletes.
 */
export async function auditTrail(investigation: Investigation, query: AuditQuery): Promise<AuditPageDTO> {
  const datasetIds = [...new Set((await liveBlocks(investigation.id)).map(b => b.settings?.datasetId).filter((id): id is string => Boolean(id)))]
  const events = await useDb().models.AuditEvent.findAll({
    where: {
      [Op.and]: [
        { newsroomId: investigation.newsroomId },
        {
          [Op.or]: [
            { investigationId: investigation.id },
            { action: { [Op.in]: DATASET_ACTIONS }, subjectId: { [Op.in]: datasetIds } },
            { action: { [Op.in]: NEWSROOM_ACTIONS } },
          ],
        },
        ...filters(query),
      ],
    },
    // Ids follow the order events were written in; the cursor is the last id shown.
    order: [['id', 'DESC']],
    limit: query.limit + 1,
  })
  const page = events.slice(0, query.limit)
  const names = await userNames(page.map(e => e.actorId))
  return {
    events: page.map(event => ({
      id: String(event.id), action: event.action, actor: event.actorId ? names.get(event.actorId) ?? 'a former member' : null,
      actorId: event.actorId, subjectType: event.subjectType, subjectId: event.subjectId, detail: event.detail, at: event.createdAt.toISOString(),
    })),
    next: events.length > query.limit ? String(page.at(-1)!.id) : null,
  }
}
