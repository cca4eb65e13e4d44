import { Op, UniqueConstraintError } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { QueueItemDTO } from '#shared/types/investigation'
import type { Claim, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { claimDTO, findInvestigation, liveBlocks, userNames } from './catalog'
import { assertFourEyes } from './four-eyes'
import { attachedClaims, claimText } from './prose-claims'
import { investigationPath, subjectAnchor } from '#shared/conversation/anchor'
import type { NotificationKind } from '#shared/types/conversation'
import { recordNotifications } from '../conversation/notifications'
import { describeThread, noteInThread } from '../conversation/threads'

/** What names a claim in a request: the id its mark carries, and its investigation where the id alone is not enough. */
export interface ClaimKey { id: string, investigationId?: string }

/**
 * The claim an id names for this member, with its investigation, for the permission check. A claim's
 * id is unique within its investigation only, so it is looked for in the member's own newsrooms: one
 * of another newsroom with the same id answers 404 like a missing one, through the same query. A
 * member who can open two claims of that id (a passage copied between investigations) names the
 * investigation.
 */
export async function findClaim(userId: string, key: ClaimKey): Promise<{ claim: Claim, investigation: Investigation }> {
  const { sequelize, models } = useDb()
  const members = sequelize.literal(`(SELECT i.id FROM investigations i JOIN memberships m ON m.newsroom_id = i.newsroom_id WHERE m.user_id = ${sequelize.escape(userId)})`)
  const investigationId = key.investigationId ? { [Op.and]: [{ [Op.eq]: key.investigationId }, { [Op.in]: members }] } : { [Op.in]: members }
  const found = await models.Claim.findAll({ where: { id: key.id, investigationId }, limit: 2 })
  if (!found.length) throw fail(404)
  if (found.length > 1) throw fail(400, [{ path: 'investigationId', message: 'Claims with this id are in several investigations you can open: add ?investigationId= to say which.' }])
  return { claim: found[0]!, investigation: await findInvestigation(found[0]!.investigationId) }
}

/** A claim of an investigation by its id; 404 when it has none. */
export async function claimOf(investigationId: string, id: string): Promise<Claim> {
  const claim = await useDb().models.Claim.findOne({ where: { investigationId, id } })
  if (!claim) throw fail(404)
  return claim
}

async function checkSupport(investigationId: string, ids: string[], transaction?: Transaction) {
  const analysis = new Set((await liveBlocks(investigationId, transaction)).filter(b => b.kind === 'analysis').map(b => b.id))
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
  // The id names a claim within this investigation only: what other investigations hold never shows.
  const exists = () => fail(409, { message: 'This claim exists already.' })
  if (await models.Claim.findOne({ where: { investigationId: investigation.id, id: input.id }, attributes: ['id'] })) throw exists()
  const claim = await sequelize.transaction(async (transaction) => {
    const created = await models.Claim.create({ id: input.id, investigationId: investigation.id, blockId: block.id, quote, supportingBlockIds: input.supportingBlockIds, createdBy: actor.userId }, { transaction })
    await audit(actor, created, 'claim.marked', { supportingBlockIds: input.supportingBlockIds }, transaction)
    return created
  }).catch((error: unknown) => {
    // The same claim marked twice at once: the second insert meets the first's key.
    throw error instanceof UniqueConstraintError ? exists() : error
  })
  return describeClaim(claim)
}

/** In-app notices of a decision on a claim, in the decision's transaction, linked to the passage. */
function noticeOfDecision(actor: Actor, claim: Claim, kind: NotificationKind, recipients: (string | null)[], excerpt: string, transaction: Transaction, threadId?: string) {
  return recordNotifications(recipients, {
    kind, newsroomId: actor.newsroomId, investigationId: claim.investigationId, actorId: actor.userId,
    anchor: subjectAnchor('claim', claim.id), threadId, excerpt,
  }, transaction)
}

/** A claim whose words were deleted is out of every list; a late request about it gets 409. */
async function assertPassage(claim: Claim) {
  const block = await useDb().models.Block.findByPk(claim.blockId, { attributes: ['id', 'content', 'deletedAt'] })
  if (!block || !attachedClaims([claim], [block]).length) throw fail(409, { message: 'The marked passage is no longer in the text.' })
}

/**
 * Locks a claim for a decision or a change of its sources, in the one order every writer uses:
 * the investigation's row, then the claim's, then (the caller's part) the blocks'. Answers the
 * claim as it now is, so a decision never acts on sources read before another request changed them.
 */
async function lockClaimForChange(claim: Claim, transaction: Transaction): Promise<Claim> {
  const { models } = useDb()
  await models.Investigation.findByPk(claim.investigationId, { transaction, lock: transaction.LOCK.UPDATE })
  const current = await models.Claim.findOne({ where: { investigationId: claim.investigationId, id: claim.id }, transaction, lock: transaction.LOCK.UPDATE })
  if (!current) throw fail(404)
  return current
}

export async function updateClaimSupport(actor: Actor, claim: Claim, supportingBlockIds: string[]) {
  await assertPassage(claim)
  const updated = await useDb().sequelize.transaction(async (transaction) => {
    const current = await lockClaimForChange(claim, transaction)
    if (current.status === 'verified') throw fail(423, { message: 'This claim is verified and locked; its sources cannot change until a data editor lifts the lock.' })
    await checkSupport(current.investigationId, supportingBlockIds, transaction)
    const before = current.supportingBlockIds
    await current.update({ supportingBlockIds }, { transaction })
    await audit(actor, current, 'claim.sources-changed', { from: before, to: supportingBlockIds }, transaction)
    return current
  })
  return describeClaim(updated)
}

/** What the fact-checker says they read: the text block's version, or the passage itself. */
export interface ReadVersion { version?: number, quote?: string }

/**
 * A fact-checker verifies a claim: its text and the analysis blocks it cites are locked. They name
 * what they read; a passage changed since answers 409 with the passage as it now is.
 */
export async function verifyClaim(actor: Actor, claim: Claim, read: ReadVersion) {
  const { sequelize, models } = useDb()
  const verified = await sequelize.transaction(async (transaction) => {
    const current = await lockClaimForChange(claim, transaction)
    if (current.status === 'verified') return current
    const block = await models.Block.findByPk(current.blockId, { transaction, lock: transaction.LOCK.UPDATE })
    const quote = claimText(block?.content, current.id)
    if (!block || block.deletedAt || !quote.trim()) throw fail(409, { message: 'The marked passage is no longer in the text; it cannot be verified.' })
    await assertFourEyes(actor, [current.createdBy, block.createdBy, block.updatedBy], 'claim', transaction)
    if ((read.version !== undefined && read.version !== block.version) || (read.quote !== undefined && read.quote !== quote)) {
      throw fail(409, { message: 'The passage changed after you read it. Read it again before verifying.', current: { quote, version: block.version } })
    }
    // The cited blocks are locked in id order, so two verifications citing the same blocks queue rather than deadlock.
    const cited = await models.Block.findAll({
      where: { id: { [Op.in]: current.supportingBlockIds } }, order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE,
    })
    if (cited.length !== current.supportingBlockIds.length || cited.some(b => b.deletedAt)) {
      throw fail(409, { message: 'A block this claim cites was removed. Choose its sources again before verifying.' })
    }
    const now = new Date()
    await current.update({ status: 'verified', quote, note: null, decidedBy: actor.userId, decidedAt: now }, { transaction })
    await models.Block.update({ lockedBy: actor.userId, lockedAt: now }, {
      where: { id: { [Op.in]: current.supportingBlockIds }, lockedAt: null }, transaction,
    })
    await audit(actor, current, 'claim.verified', { lockedBlockIds: current.supportingBlockIds, blockVersion: block.version }, transaction)
    const investigation = await models.Investigation.findByPk(current.investigationId, { attributes: ['createdBy'], transaction })
    await noticeOfDecision(actor, current, 'verified', [current.createdBy, investigation?.createdBy ?? null], quote, transaction)
    return current
  })
  return describeClaim(verified)
}

export async function disputeClaim(actor: Actor, claim: Claim, investigation: Investigation, note: string) {
  await assertPassage(claim)
  const disputed = await useDb().sequelize.transaction(async (transaction) => {
    const current = await lockClaimForChange(claim, transaction)
    if (current.status === 'verified') throw fail(423, { message: 'This claim is verified and locked. A data editor must lift the lock before it can be disputed.' })
    await current.update({ status: 'disputed', note, decidedBy: actor.userId, decidedAt: new Date() }, { transaction })
    await audit(actor, current, 'claim.disputed', { note }, transaction)
    // The note starts (or carries on) the claim's conversation, where the reporter can answer it.
    const told = [current.createdBy, investigation.createdBy]
    const threadId = await noteInThread(actor, investigation, { type: 'claim', id: current.id, blockId: current.blockId }, note, 'disputed', told, transaction)
    await noticeOfDecision(actor, current, 'disputed', told, note, transaction, threadId)
    return { claim: current, threadId }
  })
  await notifyUsers([claim.createdBy, investigation.createdBy], {
    subject: `Claim disputed: ${investigation.title}`,
    lines: [`${actor.name} disputed a claim in “${investigation.title}”:`, `“${claim.quote}”`, `Their note: ${note}`],
    path: investigationPath(investigation.id, subjectAnchor('claim', claim.id)),
  }, actor.userId)
  return { ...await describeClaim(disputed.claim), thread: await describeThread(disputed.threadId) }
}

/** A data editor lifts a lock with a written reason; blocks no other verified claim cites are unlocked too. */
export async function unlockClaim(actor: Actor, claim: Claim, investigation: Investigation, reason: string) {
  if (claim.status !== 'verified') throw fail(409, { message: 'This claim is not locked.' })
  const { sequelize, models } = useDb()
  const verifier = claim.decidedBy
  const lifted = await sequelize.transaction(async (transaction) => {
    const current = await lockClaimForChange(claim, transaction)
    if (current.status !== 'verified') throw fail(409, { message: 'This claim is not locked.' })
    await current.update({ status: 'open', decidedBy: actor.userId, decidedAt: new Date(), note: reason }, { transaction })
    const stillCited = new Set((await models.Claim.findAll({ where: { investigationId: claim.investigationId, status: 'verified' }, transaction }))
      .flatMap(c => c.supportingBlockIds))
    const release = current.supportingBlockIds.filter(id => !stillCited.has(id))
    if (release.length) await models.Block.update({ lockedBy: null, lockedAt: null }, { where: { id: { [Op.in]: release } }, transaction })
    await audit(actor, current, 'lock.lifted', { reason, unlockedBlockIds: release }, transaction)
    await noticeOfDecision(actor, current, 'lock-lifted', [current.createdBy, investigation.createdBy, verifier], reason, transaction)
    return current
  })
  await notifyUsers([claim.createdBy, investigation.createdBy, verifier], {
    subject: `Lock lifted: ${investigation.title}`,
    lines: [`${actor.name} lifted the lock on a verified claim in “${investigation.title}”:`, `“${claim.quote}”`, `Reason: ${reason}`, 'It needs fact-checking again.'],
    path: investigationPath(investigation.id, subjectAnchor('claim', claim.id)),
  }, actor.userId)
  return describeClaim(lifted)
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
    anchor: subjectAnchor('claim', claim.id),
  }))
}
