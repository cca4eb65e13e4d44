import { Op } from 'sequelize'
import type { WhereOptions } from 'sequelize'
import type { z } from 'zod'
import { changedSettings } from '#shared/history/settings-diff'
import type { auditQuerySchema } from '#shared/schemas/investigation'
import type { AnalysisSettings, AuditEventDTO, AuditPageDTO } from '#shared/types/investigation'
import type { AuditEvent, Investigation } from '../../models'
import { liveBlocks, userNames } from './catalog'
import { placeLabels } from '../history/places'
import { datasetTitles } from '../history/versions'

const NEWSROOM_ACTIONS = ['member.role-changed', 'member.removed', 'member.joined', 'member.invited', 'member.invitation-revoked']
const DATASET_ACTIONS = ['dataset.imported', 'dataset.archived', 'dataset.deleted']

export type AuditQuery = z.output<typeof auditQuerySchema>

/**
 * One filter per query field; a new filter is one more entry here and one more field in
 * `auditQuerySchema`. `kind` is an action ("claim.verified") or the family before its dot ("claim").
 */
function filters(query: Partial<AuditQuery>): WhereOptions<AuditEvent>[] {
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
  return {
    events: await describeEvents(investigation, page),
    next: events.length > query.limit ? String(page.at(-1)!.id) : null,
  }
}

const text = (value: unknown) => (typeof value === 'string' ? value : null)
const FROM_TO_LABELS: Record<string, string> = { 'investigation.renamed': 'Title', 'member.role-changed': 'Role' }

/** What an event changed, old → new, as far as it kept both. */
function changesOf(event: AuditEvent, titles: Map<string, string>): AuditEventDTO['changes'] {
  const d = event.detail
  if (d.previous !== undefined && d.settings !== undefined) {
    return changedSettings(d.previous as AnalysisSettings | null, d.settings as AnalysisSettings, titles).map(c => ({ label: c.label, from: c.before, to: c.after }))
  }
  if (FROM_TO_LABELS[event.action] && typeof d.to === 'string') return [{ label: FROM_TO_LABELS[event.action]!, from: text(d.from), to: d.to }]
  if (event.action === 'review.reset' && typeof d.was === 'string') return [{ label: 'Review', from: d.was, to: 'unreviewed' }]
  return []
}

/**
 * Events as the trail shows them: who, and the block (its place and first words, or that it was
 * removed) and the claim (its quoted words) each concerns, read from the record as it is now.
 */
async function describeEvents(investigation: Investigation, page: AuditEvent[]): Promise<AuditEventDTO[]> {
  const { models } = useDb()
  const claimIds = page.filter(e => e.subjectType === 'claim' && e.subjectId).map(e => e.subjectId!)
  const claims = claimIds.length ? await models.Claim.findAll({ where: { id: [...new Set(claimIds)], investigationId: investigation.id }, attributes: ['id', 'blockId', 'quote'] }) : []
  const claimById = new Map(claims.map(c => [c.id, c]))
  const blockOf = (e: AuditEvent) => (e.subjectType === 'block' ? e.subjectId : e.subjectType === 'claim' ? claimById.get(e.subjectId ?? '')?.blockId ?? null : null)
  const blockIds = [...new Set(page.map(blockOf).filter((id): id is string => Boolean(id)))]
  const blocks = blockIds.length ? await models.Block.findAll({ where: { id: blockIds, investigationId: investigation.id } }) : []
  const labels = await placeLabels(investigation.id, blocks)
  const names = await userNames(page.map(e => e.actorId))
  const titles = await datasetTitles(page.flatMap(e => [e.detail.previous as AnalysisSettings | undefined, e.detail.settings as AnalysisSettings | undefined]))
  return page.map(event => ({
    id: String(event.id), action: event.action, actor: event.actorId ? names.get(event.actorId) ?? 'a former member' : null,
    actorId: event.actorId, subjectType: event.subjectType, subjectId: event.subjectId, detail: event.detail, at: event.createdAt.toISOString(),
    block: labels.get(blockOf(event) ?? '') ?? null,
    claim: event.subjectType === 'claim' ? text(event.detail.quote) ?? claimById.get(event.subjectId ?? '')?.quote ?? null : null,
    changes: changesOf(event, titles),
  }))
}
