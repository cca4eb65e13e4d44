import type { Transaction } from 'sequelize'
import type { AnalysisSettings, BlockDTO, ClaimDTO, InvestigationDTO, InvestigationSummaryDTO, Stamp } from '#shared/types/investigation'
import type { Block, Claim, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { attachedClaims } from './prose-claims'
import { recordBlockVersion } from '../history/versions'
import { checkDataset } from './block-dataset'

function summary(investigation: Investigation, names: Map<string, string>): InvestigationSummaryDTO {
  return {
    id: investigation.id, title: investigation.title, status: investigation.status,
    createdBy: names.get(investigation.createdBy) ?? '', createdById: investigation.createdBy,
    updatedBy: investigation.updatedBy ? names.get(investigation.updatedBy) ?? null : null,
    updatedAt: investigation.updatedAt.toISOString(), archived: Boolean(investigation.archivedAt),
  }
}

export async function userNames(ids: (string | null | undefined)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => Boolean(id)))]
  if (!wanted.length) return new Map()
  const users = await useDb().models.User.findAll({ where: { id: wanted }, attributes: ['id', 'name'] })
  return new Map(users.map(u => [u.id, u.name]))
}

/** Who did something and when, or null when it was not done. */
export function stamp(userId: string | null | undefined, at: Date | null | undefined, names: Map<string, string>): Stamp | null {
  return userId && at ? { by: names.get(userId) ?? 'a former member', at: at.toISOString() } : null
}

function lapsedApproval(block: Block, names: Map<string, string>) {
  const approval = block.reviewStatus !== 'approved' && block.approvedSettings ? stamp(block.approvedBy, block.approvedAt, names) : null
  return approval ? { stamp: approval, settings: block.approvedSettings! } : null
}

export function blockDTO(block: Block, names: Map<string, string>): BlockDTO {
  return {
    id: block.id, kind: block.kind, position: block.position, version: block.version,
    content: block.content, settings: block.settings, updatedAt: block.updatedAt.toISOString(),
    updatedBy: block.updatedBy ? names.get(block.updatedBy) ?? null : null,
    review: block.kind === 'analysis'
      ? { status: block.reviewStatus, note: block.reviewNote ?? null, stamp: stamp(block.reviewedBy, block.reviewedAt, names), lapsed: lapsedApproval(block, names) }
      : null,
    lock: stamp(block.lockedBy, block.lockedAt, names),
  }
}

/** `quote` is the passage's words as they stand now, when the caller has read them from the block. */
export function claimDTO(claim: Claim, names: Map<string, string>, quote = claim.quote): ClaimDTO {
  return {
    id: claim.id, blockId: claim.blockId, quote, supportingBlockIds: claim.supportingBlockIds,
    status: claim.status, note: claim.note ?? null, createdBy: names.get(claim.createdBy) ?? '',
    decision: stamp(claim.decidedBy, claim.decidedAt, names),
  }
}

/** Names of everyone a block mentions (editor, reviewer, locker, last approver). */
export function blockPeople(block: Block) {
  return [block.updatedBy, block.reviewedBy, block.lockedBy, block.approvedBy]
}

export async function listInvestigations(newsroomId: string): Promise<InvestigationSummaryDTO[]> {
  const rows = await useDb().models.Investigation.findAll({ where: { newsroomId }, order: [['updatedAt', 'DESC']] })
  const names = await userNames(rows.flatMap(r => [r.createdBy, r.updatedBy]))
  return rows.map(row => summary(row, names))
}

export async function findInvestigation(id: string, transaction?: Transaction): Promise<Investigation> {
  const investigation = await useDb().models.Investigation.findByPk(id, { transaction })
  if (!investigation) throw fail(404)
  return investigation
}

export async function liveBlocks(investigationId: string, transaction?: Transaction): Promise<Block[]> {
  return useDb().models.Block.findAll({ where: { investigationId, deletedAt: null }, order: [['position', 'ASC']], transaction })
}

export async function describeInvestigation(investigation: Investigation): Promise<InvestigationDTO> {
  const blocks = await liveBlocks(investigation.id)
  const claims = await useDb().models.Claim.findAll({ where: { investigationId: investigation.id }, order: [['createdAt', 'ASC']] })
  const names = await userNames([
    investigation.createdBy, investigation.updatedBy, ...blocks.flatMap(blockPeople), ...claims.flatMap(c => [c.createdBy, c.decidedBy]),
  ])
  return {
    ...summary(investigation, names),
    newsroomId: investigation.newsroomId,
    layoutVersion: investigation.layoutVersion,
    titleVersion: investigation.titleVersion,
    blocks: blocks.map(b => blockDTO(b, names)),
    claims: attachedClaims(claims, blocks).map(({ claim, quote }) => claimDTO(claim, names, quote)),
  }
}

export async function describeBlock(block: Block): Promise<BlockDTO> {
  return blockDTO(block, await userNames(blockPeople(block)))
}

/**
 * A new investigation starts as one empty paragraph, ready to write in, and with `firstAnalysis`
 * an analysis block after it (a draft started from a dataset). Both come in one transaction: a
 * block that is refused (another newsroom's dataset) leaves no empty investigation behind.
 */
export async function createInvestigation(actor: Actor, title: string, firstAnalysis?: AnalysisSettings): Promise<InvestigationDTO> {
  const { sequelize, models } = useDb()
  const investigation = await sequelize.transaction(async (transaction) => {
    if (firstAnalysis) await checkDataset(firstAnalysis, actor.newsroomId, transaction, 'firstAnalysis.datasetId')
    const created = await models.Investigation.create({ newsroomId: actor.newsroomId, title, createdBy: actor.userId, updatedBy: actor.userId }, { transaction })
    const owner = { investigationId: created.id, createdBy: actor.userId, updatedBy: actor.userId }
    await recordAudit({ newsroomId: actor.newsroomId, investigationId: created.id, actorId: actor.userId, action: 'investigation.created', subjectType: 'investigation', subjectId: created.id, detail: { title } }, transaction)
    const first = await models.Block.create({ ...owner, kind: 'prose', position: 0, content: { type: 'doc', content: [{ type: 'paragraph' }] }, settings: null }, { transaction })
    await recordBlockVersion(first, 'created', transaction)
    if (firstAnalysis) {
      const analysis = await models.Block.create({ ...owner, kind: 'analysis', position: 1, content: null, settings: firstAnalysis }, { transaction })
      // Written as the editor's insert bar writes an added block.
      await recordAudit({ newsroomId: actor.newsroomId, investigationId: created.id, actorId: actor.userId, action: 'block.added', subjectType: 'block', subjectId: analysis.id, detail: { kind: 'analysis', position: 1 } }, transaction)
      await recordBlockVersion(analysis, 'created', transaction)
    }
    return created
  })
  return describeInvestigation(investigation)
}

/**
 * Renames or archives an investigation. A new title names the title version it was typed over; a
 * stale one answers 409 with the title as it now is, so two people renaming at once never overwrite
 * each other silently. Both changes go to the audit trail.
 */
export async function updateInvestigation(actor: Actor, investigation: Investigation, patch: { title?: string, titleVersion?: number, archived?: boolean }) {
  const { sequelize, models } = useDb()
  const updated = await sequelize.transaction(async (transaction) => {
    const current = await models.Investigation.findByPk(investigation.id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!current) throw fail(404)
    const renamed = patch.title !== undefined && patch.title !== current.title
    if (renamed && patch.titleVersion !== current.titleVersion) {
      throw fail(409, { message: 'Someone else renamed this investigation after you opened it.', current: { title: current.title, titleVersion: current.titleVersion } })
    }
    const archiving = patch.archived !== undefined && patch.archived !== Boolean(current.archivedAt)
    if (!renamed && !archiving) return current
    const from = current.title
    await current.update({
      ...(renamed ? { title: patch.title, titleVersion: current.titleVersion + 1 } : {}),
      ...(archiving ? { archivedAt: patch.archived ? new Date() : null } : {}),
      updatedBy: actor.userId,
    }, { transaction })
    const event = { newsroomId: current.newsroomId, investigationId: current.id, actorId: actor.userId, subjectType: 'investigation', subjectId: current.id }
    if (renamed) await recordAudit({ ...event, action: 'investigation.renamed', detail: { from, to: patch.title } }, transaction)
    if (archiving) await recordAudit({ ...event, action: patch.archived ? 'investigation.archived' : 'investigation.restored', detail: {} }, transaction)
    return current
  })
  return describeInvestigation(updated)
}

/** Marks the investigation as just edited by `actor`. */
export async function touchInvestigation(investigationId: string, actorId: string, transaction?: Transaction) {
  await useDb().models.Investigation.update({ updatedBy: actorId, updatedAt: new Date() }, { where: { id: investigationId }, transaction })
}
