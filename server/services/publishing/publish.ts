import { Op } from 'sequelize'
import { summarize } from '#shared/charts/summary'
import { TEST_LABELS } from '#shared/charts/labels'
import { methodologyAppendix } from '#shared/methodology/appendix'
import type { DatasetFingerprint, PublishBlockerDTO, PublishedBlock, PublishedSnapshot, PublishOutcomeDTO, ShareLinkDTO } from '#shared/types/publication'
import type { Investigation, ShareLink } from '../../models'
import type { Actor } from '../../utils/permissions'
import { liveBlocks, userNames } from '../investigations/catalog'
import { cachedAnalysis, runAnalysis } from '../investigations/analysis'

/** What stands between the investigation and a clean publication: unapproved methods, unverified claims. */
export async function publishBlockers(investigation: Investigation): Promise<PublishBlockerDTO[]> {
  const blocks = await liveBlocks(investigation.id)
  const live = new Set(blocks.map(b => b.id))
  const claims = await useDb().models.Claim.findAll({ where: { investigationId: investigation.id, status: { [Op.ne]: 'verified' } } })
  return [
    ...blocks.filter(b => b.kind === 'analysis' && b.reviewStatus !== 'approved').map(b => ({
      kind: 'unreviewed-block' as const,
      label: `${b.settings?.test ? TEST_LABELS[b.settings.test] : 'Analysis'}${b.settings?.column ? ` of “${b.settings.column}”` : ''}: method ${b.reviewStatus === 'changes-requested' ? 'sent back' : 'not approved'}`,
    })),
    ...claims.filter(c => live.has(c.blockId)).map(c => ({ kind: 'unverified-claim' as const, label: `“${c.quote.slice(0, 100)}”: ${c.status === 'disputed' ? 'disputed' : 'not verified'}` })),
  ]
}

/** Freezes the investigation as it is now: text, results, summaries, dataset fingerprints, methodology. */
async function snapshotOf(investigation: Investigation): Promise<PublishedSnapshot> {
  const { models } = useDb()
  const blocks = await liveBlocks(investigation.id)
  const published: PublishedBlock[] = []
  for (const block of blocks) {
    if (block.kind === 'prose') {
      published.push({ kind: 'prose', content: block.content ?? { type: 'doc', content: [] } })
      continue
    }
    const settings = block.settings ?? {}
    const outcome = settings.datasetId && settings.column && settings.test
      ? await cachedAnalysis(block) ?? await runAnalysis(block, investigation.newsroomId).catch(() => null)
      : null
    const result = outcome?.result ?? null
    published.push({ kind: 'analysis', settings, result, summary: result ? summarize(result) : 'This analysis was not run.' })
  }
  const datasetIds = [...new Set(blocks.map(b => b.settings?.datasetId).filter((id): id is string => Boolean(id)))]
  const datasets: DatasetFingerprint[] = (await models.Dataset.findAll({ where: { id: { [Op.in]: datasetIds } } })).map(d => ({
    id: d.id, title: d.title, sha256: d.sha256, rowCount: d.rowCount ?? null, obtainedOn: d.obtainedOn,
    sourceNote: d.sourceNote, sourceUrl: d.sourceUrl, originalName: d.originalName,
  }))
  const newsroom = await models.Newsroom.findByPk(investigation.newsroomId)
  const analyses = published.flatMap(b => (b.kind === 'analysis' ? [{ settings: b.settings, result: b.result }] : []))
  return {
    title: investigation.title,
    newsroom: newsroom?.name ?? '',
    publishedAt: new Date().toISOString(),
    blocks: published,
    datasets,
    methodology: methodologyAppendix(investigation.title, analyses, datasets),
  }
}

export function shareLinkDTO(link: ShareLink, publishedAt: Date, overrideReason: string | null, names: Map<string, string>): ShareLinkDTO {
  return {
    id: link.id, publicationId: link.publicationId, publishedAt: publishedAt.toISOString(), createdBy: names.get(link.createdBy) ?? '',
    expiresAt: link.expiresAt?.toISOString() ?? null, revokedAt: link.revokedAt?.toISOString() ?? null, overrideReason,
  }
}

/**
 * Publishes a frozen snapshot behind a new random link. Without every method approved and every
 * claim verified it needs a written reason, which the audit trail keeps with the blockers.
 */
export async function publish(actor: Actor, investigation: Investigation, options: { reason?: string, expiresAt?: string }): Promise<PublishOutcomeDTO> {
  const blockers = await publishBlockers(investigation)
  if (blockers.length && !options.reason) {
    throw fail(400, [{ path: 'reason', message: `${blockers.length} check${blockers.length === 1 ? ' is' : 's are'} not done. Finish them, or give the reason for publishing anyway.` }])
  }
  const snapshot = await snapshotOf(investigation)
  const token = newToken()
  const { sequelize, models } = useDb()
  const { link, publication } = await sequelize.transaction(async (transaction) => {
    const publication = await models.Publication.create({
      investigationId: investigation.id, snapshot, overrideReason: blockers.length ? options.reason! : null, publishedBy: actor.userId,
    }, { transaction })
    const link = await models.ShareLink.create({
      publicationId: publication.id, investigationId: investigation.id, tokenHash: hashToken(token),
      expiresAt: options.expiresAt ? new Date(options.expiresAt) : null, createdBy: actor.userId,
    }, { transaction })
    await investigation.update({ status: 'published', updatedBy: actor.userId }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId, action: 'investigation.published',
      subjectType: 'publication', subjectId: publication.id,
      detail: { title: investigation.title, reason: blockers.length ? options.reason : null, blockers: blockers.map(b => b.label), linkId: link.id, expiresAt: options.expiresAt ?? null },
    }, transaction)
    return { link, publication }
  })
  const url = `${useRuntimeConfig().publicUrl}/p/${token}`
  await notifyUsers(await membersWithRoles(actor.newsroomId, ['admin', 'data-editor', 'fact-checker', 'reporter']), {
    subject: `Published: ${investigation.title}`,
    lines: [`${actor.name} published “${investigation.title}”.${blockers.length ? ` They published with ${blockers.length} ${blockers.length === 1 ? 'check' : 'checks'} open, giving this reason: ${options.reason}` : ''}`, 'The public link is in the investigation, under Publishing.'],
    path: `/investigations/${investigation.id}`,
  }, actor.userId)
  return { url, link: shareLinkDTO(link, publication.publishedAt, publication.overrideReason, await userNames([actor.userId])) }
}

export async function listShareLinks(investigation: Investigation): Promise<ShareLinkDTO[]> {
  const { models } = useDb()
  const links = await models.ShareLink.findAll({ where: { investigationId: investigation.id }, order: [['createdAt', 'DESC']] })
  const publications = new Map((await models.Publication.findAll({ where: { investigationId: investigation.id }, attributes: ['id', 'publishedAt', 'overrideReason'] })).map(p => [p.id, p]))
  const names = await userNames(links.map(l => l.createdBy))
  return links.map(link => shareLinkDTO(link, publications.get(link.publicationId)!.publishedAt, publications.get(link.publicationId)!.overrideReason, names))
}

export async function findShareLink(id: string): Promise<ShareLink> {
  const link = await useDb().models.ShareLink.findByPk(id)
  if (!link) throw fail(404)
  return link
}

/** Revokes a link: from then on it answers 404. */
export async function revokeShareLink(actor: Actor, link: ShareLink) {
  if (link.revokedAt) return
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    await link.update({ revokedAt: new Date(), revokedBy: actor.userId }, { transaction })
    const stillOpen = await models.ShareLink.count({ where: { investigationId: link.investigationId, revokedAt: null }, transaction })
    if (!stillOpen) await models.Investigation.update({ status: 'in-review' }, { where: { id: link.investigationId, status: 'published' }, transaction })
    await recordAudit({ newsroomId: actor.newsroomId, investigationId: link.investigationId, actorId: actor.userId, action: 'investigation.unpublished', subjectType: 'share-link', subjectId: link.id }, transaction)
  })
}
