import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { can } from '#shared/auth/permissions'
import { summarize } from '#shared/charts/summary'
import { TEST_LABELS } from '#shared/charts/labels'
import { methodologyAppendix } from '#shared/methodology/appendix'
import { periodOf } from '#shared/charts/chart-text'
import type { z } from 'zod'
import type { publishSchema } from '#shared/schemas/investigation'
import type { DatasetFingerprint, PublishBlockerDTO, PublishCheckDTO, PublishedBlock, PublishedChecks, PublishedSnapshot, PublishingDTO, PublishOutcomeDTO, ShareLinkDTO, WithdrawOutcomeDTO } from '#shared/types/publication'
import type { Block, Claim, Investigation, Publication, ShareLink } from '../../models'
import type { FieldError } from '../../utils/errors'
import type { Actor } from '../../utils/permissions'
import { findInvestigation, liveBlocks, stamp, userNames } from '../investigations/catalog'
import { cachedAnalysis, runAnalysis } from '../investigations/analysis'
import { datasetColumns } from '../datasets/catalog'
import { attachedClaims, filterClaimMarks } from '../investigations/prose-claims'
import { recordNotifications } from '../conversation/notifications'

/** The investigation's live blocks and the claims still attached to their words: what every check reads. */
interface CheckState {
  blocks: Block[]
  claims: { claim: Claim, quote: string }[]
}

async function checkState(investigation: Investigation): Promise<CheckState> {
  const blocks = await liveBlocks(investigation.id)
  const claims = await useDb().models.Claim.findAll({ where: { investigationId: investigation.id }, order: [['createdAt', 'ASC']] })
  return { blocks, claims: attachedClaims(claims, blocks) }
}

const analysisBlocks = (state: CheckState) => state.blocks.filter(b => b.kind === 'analysis')
const methodLabel = (b: Block) => `${b.settings?.test ? TEST_LABELS[b.settings.test] : 'Analysis'}${b.settings?.column ? ` of “${b.settings.column}”` : ''}`
const quoteLabel = (quote: string) => `“${quote.length > 100 ? `${quote.slice(0, 100)}…` : quote}”`

/** What stands between the investigation and a clean publication: unapproved methods, unverified or disputed claims. */
function blockersOf(state: CheckState): PublishBlockerDTO[] {
  return [
    ...analysisBlocks(state).filter(b => b.reviewStatus !== 'approved').map(b => ({
      kind: 'unreviewed-block' as const, id: b.id, label: `${methodLabel(b)}: method ${b.reviewStatus === 'sent-back' ? 'sent back' : 'not approved'}`,
    })),
    ...state.claims.filter(({ claim }) => claim.status !== 'verified').map(({ claim, quote }) => ({
      kind: claim.status === 'disputed' ? 'disputed-claim' as const : 'unverified-claim' as const,
      id: claim.id, label: `${quoteLabel(quote)}: ${claim.status === 'disputed' ? 'disputed' : 'not verified'}`,
    })),
  ]
}

/** The record of the checks as the public page states it: counts only, and whether four eyes held for each. */
function publishedChecks(state: CheckState): PublishedChecks {
  const methods = analysisBlocks(state)
  const approved = methods.filter(b => b.reviewStatus === 'approved')
  const verified = state.claims.filter(({ claim }) => claim.status === 'verified')
  return {
    methods: { approved: approved.length, total: methods.length },
    claims: { verified: verified.length, disputed: state.claims.filter(({ claim }) => claim.status === 'disputed').length, total: state.claims.length },
    independent: approved.every(b => b.reviewedBy !== b.createdBy) && verified.every(({ claim }) => claim.decidedBy !== claim.createdBy),
  }
}

/** Freezes the investigation as it is now: text, results, summaries, dataset fingerprints, methodology. */
async function snapshotOf(investigation: Investigation, state: CheckState, followUpConfirmed: boolean): Promise<PublishedSnapshot> {
  const { models } = useDb()
  // Only verified claims keep their marking: the public page marks nothing the record does not show as checked.
  const verifiedClaims = state.claims.filter(({ claim }) => claim.status === 'verified').map(({ claim }) => claim.id)
  const keep = new Set(verifiedClaims)
  const published: PublishedBlock[] = []
  for (const block of state.blocks) {
    if (block.kind === 'prose') {
      published.push({ kind: 'prose', content: filterClaimMarks(block.content ?? { type: 'doc', content: [] }, id => keep.has(id)) })
      continue
    }
    const settings = block.settings ?? {}
    const outcome = settings.datasetId && settings.column && settings.test
      ? await cachedAnalysis(block) ?? await runAnalysis(block, investigation.newsroomId).catch(() => null)
      : null
    const result = outcome?.result ?? null
    published.push({ kind: 'analysis', settings, result, summary: result ? summarize(result) : 'This analysis was not run.' })
  }
  const datasetIds = [...new Set(state.blocks.map(b => b.settings?.datasetId).filter((id): id is string => Boolean(id)))]
  const datasets: DatasetFingerprint[] = await Promise.all((await models.Dataset.findAll({ where: { id: { [Op.in]: datasetIds } } })).map(async d => ({
    id: d.id, title: d.title, sha256: d.sha256, rowCount: d.rowCount ?? null, obtainedOn: d.obtainedOn,
    sourceNote: d.sourceNote, sourceUrl: d.sourceUrl, originalName: d.originalName, period: periodOf(await datasetColumns(d.id)),
  })))
  const newsroom = await models.Newsroom.findByPk(investigation.newsroomId)
  const analyses = published.flatMap(b => (b.kind === 'analysis' ? [{ settings: b.settings, result: b.result }] : []))
  const checks = publishedChecks(state)
  return {
    title: investigation.title,
    newsroom: newsroom?.name ?? '',
    publishedAt: new Date().toISOString(),
    blocks: published,
    datasets,
    methodology: methodologyAppendix(investigation.title, analyses, datasets, { checks, followUpConfirmed }),
    verifiedClaims,
    checks,
  }
}

function linkState(link: ShareLink): ShareLinkDTO['state'] {
  if (link.revokedAt) return 'withdrawn'
  return link.expiresAt && link.expiresAt <= new Date() ? 'expired' : 'live'
}

/**
 * A link as the publishing panel shows it. `showAddress` (members who may publish) adds the public
 * address of a live link, derived again from the server secret; a stored hash that the derived
 * token does not match (a link made before, or under another secret) is said to be lost, never
 * shown wrong.
 */
export function shareLinkDTO(link: ShareLink, publication: Publication, names: Map<string, string>, showAddress: boolean): ShareLinkDTO {
  const state = linkState(link)
  const token = shareLinkToken(link.id)
  const derivable = hashToken(token) === link.tokenHash
  return {
    id: link.id, publicationId: link.publicationId, publishedAt: publication.publishedAt.toISOString(), createdBy: names.get(link.createdBy) ?? '',
    expiresAt: link.expiresAt?.toISOString() ?? null, revokedAt: link.revokedAt?.toISOString() ?? null, state,
    url: showAddress && state === 'live' && derivable ? `${useRuntimeConfig().publicUrl}/p/${token}` : null,
    addressLost: state === 'live' && !derivable,
    overrideReason: publication.overrideReason, disputedReason: publication.disputedReason ?? null,
    followUpConfirmedBy: publication.followUpConfirmedBy ? names.get(publication.followUpConfirmedBy) ?? 'a former member' : null,
  }
}

type PublishOptions = z.output<typeof publishSchema>

/** The decisions an open check needs: a reason for the general override, a decision of its own for disputed claims. */
function assertDecisions(blockers: PublishBlockerDTO[], options: PublishOptions) {
  const general = blockers.filter(b => b.kind !== 'disputed-claim')
  const disputed = blockers.filter(b => b.kind === 'disputed-claim')
  const errors: FieldError[] = []
  if (general.length && !options.reason) {
    errors.push({ path: 'reason', message: `${general.length} check${general.length === 1 ? ' is' : 's are'} not done. Finish them, or give the reason for publishing anyway.` })
  }
  if (disputed.length && !options.disputed) {
    errors.push({ path: 'disputed', message: `${disputed.length === 1 ? 'A claim is' : `${disputed.length} claims are`} disputed. Publishing ${disputed.length === 1 ? 'it' : 'them'} as written needs its own decision: name the claims and say why.` })
  }
  else if (disputed.length && options.disputed) {
    const named = new Set(options.disputed.claimIds)
    if (disputed.some(b => !named.has(b.id))) errors.push({ path: 'disputed', message: 'A claim was disputed after you read the list: read it again and decide.' })
  }
  if (errors.length) throw fail(400, errors)
}

/**
 * Publishes a frozen snapshot behind a new link. Without every method approved and every claim
 * verified it needs a written reason; disputed claims need a decision of their own; the follow-up
 * statement appears in the methodology only when the publisher confirms it. The audit trail keeps
 * each decision with who made it.
 */
export async function publish(actor: Actor, investigation: Investigation, options: PublishOptions): Promise<PublishOutcomeDTO> {
  const state = await checkState(investigation)
  const blockers = blockersOf(state)
  assertDecisions(blockers, options)
  const general = blockers.filter(b => b.kind !== 'disputed-claim')
  const disputed = state.claims.filter(({ claim }) => claim.status === 'disputed')
  const followUpConfirmed = options.followUpConfirmed === true
  const snapshot = await snapshotOf(investigation, state, followUpConfirmed)
  const linkId = randomUUID()
  const token = shareLinkToken(linkId)
  const { sequelize, models } = useDb()
  const { link, publication } = await sequelize.transaction(async (transaction) => {
    const publication = await models.Publication.create({
      investigationId: investigation.id, snapshot, publishedBy: actor.userId,
      blockVersions: state.blocks.map(b => ({ blockId: b.id, version: b.version })),
      overrideReason: general.length ? options.reason! : null,
      disputedReason: disputed.length ? options.disputed!.reason : null,
      followUpConfirmedBy: followUpConfirmed ? actor.userId : null,
    }, { transaction })
    const link = await models.ShareLink.create({
      id: linkId, publicationId: publication.id, investigationId: investigation.id, tokenHash: hashToken(token),
      expiresAt: options.expiresAt ? new Date(options.expiresAt) : null, createdBy: actor.userId,
    }, { transaction })
    await investigation.update({ status: 'published', updatedBy: actor.userId }, { transaction })
    const entry = { newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId }
    await recordAudit({
      ...entry, action: 'investigation.published', subjectType: 'publication', subjectId: publication.id,
      detail: {
        title: investigation.title, reason: general.length ? options.reason : null, blockers: blockers.map(b => b.label),
        linkId: link.id, expiresAt: options.expiresAt ?? null, followUpConfirmed,
      },
    }, transaction)
    for (const { claim, quote } of disputed) {
      await recordAudit({
        ...entry, action: 'claim.published-disputed', subjectType: 'claim', subjectId: claim.id,
        detail: { quote, note: claim.note ?? null, reason: options.disputed!.reason, publicationId: publication.id },
      }, transaction)
    }
    if (followUpConfirmed) {
      await recordAudit({ ...entry, action: 'publication.follow-up-confirmed', subjectType: 'publication', subjectId: publication.id }, transaction)
    }
    await recordNotifications(await membersWithRoles(actor.newsroomId, ['admin', 'data-editor', 'fact-checker', 'reporter']), {
      ...entry, kind: 'published', excerpt: general.length ? options.reason : '',
    }, transaction)
    return { link, publication }
  })
  const open = general.length + disputed.length
  await notifyUsers(await membersWithRoles(actor.newsroomId, ['admin', 'data-editor', 'fact-checker', 'reporter']), {
    subject: `Published: ${investigation.title}`,
    lines: [
      `${actor.name} published “${investigation.title}”.${general.length ? ` They published with ${open} ${open === 1 ? 'check' : 'checks'} open, giving this reason: ${options.reason}` : ''}`,
      ...(disputed.length ? [`${disputed.length === 1 ? 'One claim was' : `${disputed.length} claims were`} published while disputed, for this reason: ${options.disputed!.reason}`] : []),
      'Data editors and admins can open and copy the public link in the investigation, under Publishing.',
    ],
    path: `/investigations/${investigation.id}`,
  }, actor.userId)
  const names = await userNames([actor.userId])
  return { url: `${useRuntimeConfig().publicUrl}/p/${token}`, link: shareLinkDTO(link, publication, names, true) }
}

/** Every check with who made the thing checked and who checked it: the publishing panel's list. */
function checksOf(state: CheckState, names: Map<string, string>): PublishCheckDTO[] {
  return [
    ...analysisBlocks(state).map(b => ({
      kind: 'method' as const, id: b.id, label: methodLabel(b), status: b.reviewStatus,
      author: names.get(b.createdBy) ?? 'a former member', decision: stamp(b.reviewedBy, b.reviewedAt, names),
    })),
    ...state.claims.map(({ claim, quote }) => ({
      kind: 'claim' as const, id: claim.id, label: quoteLabel(quote), status: claim.status,
      author: names.get(claim.createdBy) ?? 'a former member', decision: stamp(claim.decidedBy, claim.decidedAt, names),
    })),
  ]
}

/** The publishing panel: open checks, who did each check, the newsroom's four-eyes setting and the links. */
export async function publishingPanel(actor: Actor, investigation: Investigation): Promise<PublishingDTO> {
  const { models } = useDb()
  const state = await checkState(investigation)
  const links = await models.ShareLink.findAll({ where: { investigationId: investigation.id }, order: [['createdAt', 'DESC']] })
  const publications = new Map((await models.Publication.findAll({ where: { investigationId: investigation.id } })).map(p => [p.id, p]))
  const names = await userNames([
    ...links.map(l => l.createdBy), ...[...publications.values()].map(p => p.followUpConfirmedBy),
    ...state.blocks.flatMap(b => [b.createdBy, b.reviewedBy]), ...state.claims.flatMap(({ claim }) => [claim.createdBy, claim.decidedBy]),
  ])
  const newsroom = await models.Newsroom.findByPk(investigation.newsroomId, { attributes: ['fourEyes'] })
  const showAddress = can(actor.role, 'investigation.publish')
  return {
    blockers: blockersOf(state),
    checks: checksOf(state, names),
    links: links.map(link => shareLinkDTO(link, publications.get(link.publicationId)!, names, showAddress)),
    fourEyes: newsroom?.fourEyes ?? true,
  }
}

export async function findShareLink(id: string): Promise<ShareLink> {
  const link = await useDb().models.ShareLink.findByPk(id)
  if (!link) throw fail(404)
  return link
}

/** Withdraws a link: from then on it answers 410 with a page that says so. */
export async function revokeShareLink(actor: Actor, link: ShareLink): Promise<WithdrawOutcomeDTO> {
  const { sequelize, models } = useDb()
  if (!link.revokedAt) {
    await sequelize.transaction(async (transaction) => {
      // In the one lock order (the investigation's row first), and read again under the lock: of
      // several withdrawals at once, one withdraws and writes the trail, the others find it done.
      await models.Investigation.findByPk(link.investigationId, { transaction, lock: transaction.LOCK.UPDATE })
      const current = await models.ShareLink.findByPk(link.id, { transaction, lock: transaction.LOCK.UPDATE })
      if (!current || current.revokedAt) return
      await current.update({ revokedAt: new Date(), revokedBy: actor.userId }, { transaction })
      const stillOpen = await models.ShareLink.count({ where: { investigationId: link.investigationId, revokedAt: null }, transaction })
      if (!stillOpen) await models.Investigation.update({ status: 'in-review' }, { where: { id: link.investigationId, status: 'published' }, transaction })
      await recordAudit({ newsroomId: actor.newsroomId, investigationId: link.investigationId, actorId: actor.userId, action: 'investigation.unpublished', subjectType: 'share-link', subjectId: link.id }, transaction)
    })
  }
  // The panel shows the answer as it is: the link withdrawn, and the investigation back in review when it was the last live one.
  const withdrawn = (await models.ShareLink.findByPk(link.id))!
  const [publication, investigation] = await Promise.all([models.Publication.findByPk(withdrawn.publicationId), findInvestigation(withdrawn.investigationId)])
  const names = await userNames([withdrawn.createdBy, publication!.followUpConfirmedBy])
  return { ok: true, link: shareLinkDTO(withdrawn, publication!, names, true), investigationStatus: investigation.status }
}

/** A publication with its investigation, for the permission check; 404 when missing. */
export async function findPublication(id: string): Promise<{ publication: Publication, investigation: Investigation }> {
  const publication = await useDb().models.Publication.findByPk(id)
  if (!publication) throw fail(404)
  return { publication, investigation: await findInvestigation(publication.investigationId) }
}
