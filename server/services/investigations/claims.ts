import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { QueueItemDTO } from '#shared/types/investigation'
import type { Claim, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { claimDTO, findInvestigation, liveBlocks, userNames } from './catalog'
import { assertFourEyes } from './four-eyes'
import { attachedClaims, claimText } from './prose-claims'

/** The claim behind an id with its investigation, for the permission check; 404 when missing. */
export async function findClaim(id: string): Promise<{ claim: Claim, investigation: Investigation }> {
  const claim = await useDb().models.Claim.findByPk(id)
  if (!claim) throw fail(404)
  return { claim, investigation: await findInvestigation(claim.investigationId) }
}

async function checkSupport(investigationId: string, ids: string[]) {
  const analysis = new Set((await liveBlocks(investigationId)).filter(b => b.kind === 'analysis').map(b => b.id))
  if (ids.some(id => !analysis.has(id))) throw fail(400, [{ path: 'supportingBlockIds', message: 'A claim can cite only analysis blocks of the same investigation.' }])
}

async function describeClaim(claim: Claim) {
  return claimDTO(claim, await userNames([claim.createdBy, claim.decidedBy]))
}

function audit(actor: Actor, claim: Claim, action: string, detail: Record<string, unknown>, transaction: Transaction) {
  return recordAudit({ newsroomId: actor.newsroomId, investigationId: claim.investigationId, actorId: actor.userId, action, subjectType: 'claim', subjectId: claim.id, detail: { quote: claim.quote, ...detail } }, transaction)
}

/**
 * Marks a passage as a claim. The editor has already wrapped the passage in a claim mark with
 * this id and saved the block; the server reads the passage from the saved block.
 */
export async function createClaim(actor: Actor, investigation: Investigation, input: { id: string, blockId: string, supportingBlockIds: string[] }) {
  const { sequelize, models } = useDb()
  const block = await models.Block.findOne({ where: { id: input.blockId, investigationId: investigation.id, kind: 'prose', deletedAt: null } })
  if (!block) throw fail(400, [{ path: 'blockId', message: 'Claims are marked in text blocks of this investigation.' }])
  const quote = claimText(block.content, input.id)
  if (!quote.trim()) throw fail(400, [{ path: 'id', message: 'Save the marked passage first: the text block holds no passage with this claim mark.' }])
  await checkSupport(investigation.id, input.supportingBlockIds)
  if (await models.Claim.count({ where: { id: input.id } })) throw fail(409, { message: 'This claim exists already.' })
  const claim = await sequelize.transaction(async (transaction) => {
    const created = await models.Claim.create({ id: input.id, investigationId: investigation.id, blockId: block.id, quote, supportingBlockIds: input.supportingBlockIds, createdBy: actor.userId }, { transaction })
    await audit(actor, created, 'claim.marked', { supportingBlockIds: input.supportingBlockIds }, transaction)
    return created
  })
  return describeClaim(claim)
}

/** A claim whose words were deleted is out of every list; a late request about it gets 409. */
async function assertPassage(claim: Claim) {
  const block = await useDb().models.Block.findByPk(claim.blockId, { attributes: ['id', 'content', 'deletedAt'] })
  if (!block || !attachedClaims([claim], [block]).length) throw fail(409, { message: 'The marked passage is no longer in the text.' })
}

export async function updateClaimSupport(actor: Actor, claim: Claim, supportingBlockIds: string[]) {
  if (claim.status === 'verified') throw fail(423, { message: 'This claim is verified and locked; its sources cannot change until a data editor lifts the lock.' })
  await assertPassage(claim)
  await checkSupport(claim.investigationId, supportingBlockIds)
  await claim.update({ supportingBlockIds })
  return describeClaim(claim)
}

/** A fact-checker verifies a claim: its text and the analysis blocks it cites are locked. */
export async function verifyClaim(actor: Actor, claim: Claim) {
  const { sequelize, models } = useDb()
  if (claim.status === 'verified') return describeClaim(claim)
  await sequelize.transaction(async (transaction) => {
    const block = await models.Block.findByPk(claim.blockId, { transaction, lock: transaction.LOCK.UPDATE })
    const quote = claimText(block?.content, claim.id)
    if (!block || block.deletedAt || !quote.trim()) throw fail(409, { message: 'The marked passage is no longer in the text; it cannot be verified.' })
    await assertFourEyes(actor, [claim.createdBy, block.createdBy, block.updatedBy], 'claim', transaction)
    const now = new Date()
    await claim.update({ status: 'verified', quote, note: null, decidedBy: actor.userId, decidedAt: now }, { transaction })
    await models.Block.update({ lockedBy: actor.userId, lockedAt: now }, {
      where: { id: { [Op.in]: claim.supportingBlockIds }, lockedAt: null }, transaction,
    })
    await audit(actor, claim, 'claim.verified', { lockedBlockIds: claim.supportingBlockIds }, transaction)
  })
  return describeClaim(claim)
}

export async function disputeClaim(actor: Actor, claim: Claim, investigation: Investigation, note: string) {
  if (claim.status === 'verified') throw fail(423, { message: 'This claim is verified and locked. A data editor must lift the lock before it can be disputed.' })
  await assertPassage(claim)
  await useDb().sequelize.transaction(async (transaction) => {
    await claim.update({ status: 'disputed', note, decidedBy: actor.userId, decidedAt: new Date() }, { transaction })
    await audit(actor, claim, 'claim.disputed', { note }, transaction)
  })
  await notifyUsers([claim.createdBy, investigation.createdBy], {
    subject: `Claim disputed: ${investigation.title}`,
    lines: [`${actor.name} disputed a claim in “${investigation.title}”:`, `“${claim.quote}”`, `Their note: ${note}`],
    path: `/investigations/${investigation.id}`,
  }, actor.userId)
  return describeClaim(claim)
}

/** A data editor lifts a lock with a written reason; blocks no other verified claim cites are unlocked too. */
export async function unlockClaim(actor: Actor, claim: Claim, investigation: Investigation, reason: string) {
  if (claim.status !== 'verified') throw fail(409, { message: 'This claim is not locked.' })
  const { sequelize, models } = useDb()
  const verifier = claim.decidedBy
  await sequelize.transaction(async (transaction) => {
    await claim.update({ status: 'open', decidedBy: actor.userId, decidedAt: new Date(), note: reason }, { transaction })
    const stillCited = new Set((await models.Claim.findAll({ where: { investigationId: claim.investigationId, status: 'verified' }, transaction }))
      .flatMap(c => c.supportingBlockIds))
    const release = claim.supportingBlockIds.filter(id => !stillCited.has(id))
    if (release.length) await models.Block.update({ lockedBy: null, lockedAt: null }, { where: { id: { [Op.in]: release } }, transaction })
    await audit(actor, claim, 'lock.lifted', { reason, unlockedBlockIds: release }, transaction)
  })
  await notifyUsers([claim.createdBy, investigation.createdBy, verifier], {
    subject: `Lock lifted: ${investigation.title}`,
    lines: [`${actor.name} lifted the lock on a verified claim in “${investigation.title}”:`, `“${claim.quote}”`, `Reason: ${reason}`, 'It needs fact-checking again.'],
    path: `/investigations/${investigation.id}`,
  }, actor.userId)
  return describeClaim(claim)
}

/** What waits for a fact-checker: open and disputed claims of the newsroom's live investigations. */
export async function factCheckQueue(newsroomId: string): Promise<QueueItemDTO[]> {
  const { models } = useDb()
  const investigations = await models.Investigation.findAll({ where: { newsroomId, archivedAt: null } })
  if (!investigations.length) return []
  const byId = new Map(investigations.map(i => [i.id, i]))
  const claims = await models.Claim.findAll({
    where: { investigationId: { [Op.in]: [...byId.keys()] }, status: { [Op.in]: ['open', 'disputed'] } },
    order: [['createdAt', 'ASC']],
  })
  const blocks = await models.Block.findAll({ where: { id: { [Op.in]: claims.map(c => c.blockId) }, deletedAt: null }, attributes: ['id', 'content'] })
  return attachedClaims(claims, blocks).map(({ claim, quote }) => ({
    investigationId: claim.investigationId,
    investigationTitle: byId.get(claim.investigationId)!.title,
    blockId: claim.blockId,
    label: quote,
    status: claim.status,
    note: claim.note ?? null,
  }))
}
