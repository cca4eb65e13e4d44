import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { z } from 'zod'
import type { blockCreateSchema, blockUpdateSchema } from '#shared/schemas/investigation'
import type { Block, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { describeBlock, describeInvestigation, findInvestigation, liveBlocks, touchInvestigation } from './catalog'
import { assertNoBorrowedMarks, assertUnlocked } from './locks'
import { recordBlockVersion } from '../history/versions'
import { checkDataset } from './block-dataset'

/** The block behind an id with its investigation, for the permission check; 404 when missing or removed. */
export async function findBlock(id: string, { includeRemoved = false } = {}): Promise<{ block: Block, investigation: Investigation }> {
  const block = await useDb().models.Block.findByPk(id)
  if (!block || (block.deletedAt && !includeRemoved)) throw fail(404)
  return { block, investigation: await findInvestigation(block.investigationId) }
}

function auditBlock(actor: Actor, block: Block, action: string, detail: Record<string, unknown>, transaction: Transaction) {
  return recordAudit({ newsroomId: actor.newsroomId, investigationId: block.investigationId, actorId: actor.userId, action, subjectType: 'block', subjectId: block.id, detail }, transaction)
}

/** A person's saves of one text block less than this long after their last recorded one show as that one edit. */
const EDIT_COALESCE_MS = 5 * 60 * 1000

/**
 * Writes a save to the trail. A change of method is one event each, with the settings before and
 * after; text is saved every few seconds while someone types, so a person's saves of one block
 * within five minutes of their last recorded edit of it are that edit (the block's own version and
 * time say where it now stands). A restore of an earlier version is always an event of its own.
 */
async function auditEdit(actor: Actor, block: Block, fromVersion: number, change: { previous: unknown, settings: unknown, restoredFrom?: number }, transaction: Transaction) {
  const { previous, settings, restoredFrom } = change
  if (settings === undefined && restoredFrom === undefined) {
    const recent = await useDb().models.AuditEvent.findOne({
      where: {
        investigationId: block.investigationId, subjectType: 'block', subjectId: block.id, action: 'block.edited',
        actorId: actor.userId, createdAt: { [Op.gt]: new Date(Date.now() - EDIT_COALESCE_MS) },
      },
      attributes: ['id'], transaction,
    })
    if (recent) return
  }
  await auditBlock(actor, block, restoredFrom === undefined ? 'block.edited' : 'block.version-restored', {
    kind: block.kind, fromVersion, ...(settings === undefined ? {} : { settings, previous }),
    ...(restoredFrom === undefined ? {} : { restoredFrom, version: block.version }),
  }, transaction)
}

/**
 * What a change of settings does to the block's review: a reviewed method that changes needs a fresh
 * review, and settings that come back to the ones last approved bring that approval back (who and
 * when as they were). Null when the review stays as it is.
 */
function reviewAfterChange(block: Block, fingerprint: string) {
  if (block.approvedFingerprint === fingerprint && block.approvedBy && block.approvedAt && block.reviewStatus !== 'approved') {
    return {
      fields: { reviewStatus: 'approved' as const, reviewNote: null, reviewedBy: block.approvedBy, reviewedAt: block.approvedAt },
      action: 'review.restored', detail: { approvedAt: block.approvedAt.toISOString(), reason: 'settings back to the approved ones' },
    }
  }
  if (block.reviewStatus === 'unreviewed') return null
  return {
    fields: { reviewStatus: 'unreviewed' as const, reviewNote: null, reviewedBy: null, reviewedAt: null },
    action: 'review.reset', detail: { was: block.reviewStatus, reason: 'settings changed' },
  }
}

export async function createBlock(actor: Actor, investigation: Investigation, input: z.output<typeof blockCreateSchema>) {
  const { sequelize, models } = useDb()
  if (input.kind === 'analysis') await checkDataset(input.settings, investigation.newsroomId)
  const block = await sequelize.transaction(async (transaction) => {
    await models.Investigation.findByPk(investigation.id, { transaction, lock: transaction.LOCK.UPDATE })
    if (input.kind === 'prose') await assertNoBorrowedMarks(investigation.id, null, input.content, transaction)
    const blocks = await liveBlocks(investigation.id, transaction)
    const after = input.afterBlockId === undefined ? blocks.length - 1 : blocks.findIndex(b => b.id === input.afterBlockId)
    if (input.afterBlockId && after < 0) throw fail(400, [{ path: 'afterBlockId', message: 'That block is not in this investigation.' }])
    const position = after + 1
    // Make room: every later block moves down one place.
    for (const later of blocks.slice(position)) await later.update({ position: later.position + 1 }, { transaction })
    const created = await models.Block.create({
      investigationId: investigation.id, kind: input.kind, position,
      content: input.kind === 'prose' ? input.content ?? { type: 'doc', content: [{ type: 'paragraph' }] } : null,
      settings: input.kind === 'analysis' ? input.settings ?? {} : null,
      createdBy: actor.userId, updatedBy: actor.userId,
    }, { transaction })
    await models.Investigation.increment('layoutVersion', { where: { id: investigation.id }, transaction })
    await touchInvestigation(investigation.id, actor.userId, transaction)
    await auditBlock(actor, created, 'block.added', { kind: created.kind, position }, transaction)
    await recordBlockVersion(created, 'created', transaction)
    return created
  })
  return describeBlock(block)
}

/**
 * Locks the investigation's row, then the block's, for a change to the block, and answers the block
 * as it now is (404 when removed, unless `includeRemoved`). Every change that touches both rows
 * takes them in this order; a save that took the block first and the investigation second could
 * wait on a block insertion doing the reverse, a deadlock PostgreSQL ends with an error.
 */
export async function lockBlockForChange(block: Block, transaction: Transaction, { includeRemoved = false } = {}): Promise<Block> {
  const { models } = useDb()
  await models.Investigation.findByPk(block.investigationId, { transaction, lock: transaction.LOCK.UPDATE })
  const current = await models.Block.findByPk(block.id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!current || (current.deletedAt && !includeRemoved)) throw fail(404)
  return current
}

/**
 * Saves a block against the version the editor last saw. A stale version answers 409 with the
 * block as it now is, so the editor can show both and nothing is lost silently.
 *
 * The block's row is locked for the whole save: the version check, the lock and review checks and
 * the write all see the same row, and a fact-checker's verification (which locks the same row)
 * either comes before the save and is respected, or waits until the save is done. Each save is one
 * version of the block's history; `restoredFrom` names the earlier version a restore brings back.
 */
export async function updateBlock(actor: Actor, block: Block, input: z.output<typeof blockUpdateSchema>, restoredFrom?: number) {
  const { sequelize } = useDb()
  if (input.content && block.kind !== 'prose') throw fail(400, [{ path: 'content', message: 'Only prose blocks hold text.' }])
  if (input.settings && block.kind !== 'analysis') throw fail(400, [{ path: 'settings', message: 'Only analysis blocks hold settings.' }])
  await checkDataset(input.settings, (await findInvestigation(block.investigationId)).newsroomId)
  const outcome = await sequelize.transaction(async (transaction) => {
    const current = await lockBlockForChange(block, transaction)
    if (current.version !== input.version) return { stale: true, block: current }
    // jsonb hands keys back in its own order, so a plain string comparison would see a change in every resave.
    const fingerprint = input.settings !== undefined ? fingerprintOf(input.settings) : undefined
    const settingsChanged = fingerprint !== undefined && fingerprint !== fingerprintOf(current.settings ?? {})
    await assertUnlocked(current, { content: input.content, settings: settingsChanged ? input.settings : undefined }, transaction)
    const review = settingsChanged ? reviewAfterChange(current, fingerprint) : null
    const previous = current.settings
    await current.update({
      ...(input.content ? { content: input.content } : {}),
      ...(input.settings ? { settings: input.settings } : {}),
      ...review?.fields,
      version: input.version + 1,
      updatedBy: actor.userId,
    }, { transaction })
    await recordBlockVersion(current, restoredFrom === undefined ? 'edited' : 'restored', transaction, restoredFrom)
    if (input.content || settingsChanged || restoredFrom !== undefined) {
      await auditEdit(actor, current, input.version, { previous, settings: settingsChanged ? input.settings : undefined, restoredFrom }, transaction)
    }
    if (review) {
      await recordAudit({
        newsroomId: actor.newsroomId, investigationId: block.investigationId, actorId: actor.userId, action: review.action,
        subjectType: 'block', subjectId: block.id, detail: review.detail,
      }, transaction)
    }
    await touchInvestigation(block.investigationId, actor.userId, transaction)
    return { stale: false, block: current }
  })
  if (outcome.stale) {
    throw fail(409, { message: 'Someone else saved this block after you opened it.', current: await describeBlock(outcome.block) })
  }
  return describeBlock(outcome.block)
}

/** Removes a block from the document; it is kept so that "undo" can bring it back. */
export async function removeBlock(actor: Actor, block: Block) {
  const { sequelize } = useDb()
  await sequelize.transaction(async (transaction) => {
    // Checked under the row lock, so a verification that locks the block cannot slip in between.
    const current = await lockBlockForChange(block, transaction)
    await assertUnlocked(current, { removing: true }, transaction)
    await current.update({ deletedAt: new Date(), updatedBy: actor.userId }, { transaction })
    await useDb().models.Investigation.increment('layoutVersion', { where: { id: block.investigationId }, transaction })
    await touchInvestigation(block.investigationId, actor.userId, transaction)
    await auditBlock(actor, current, 'block.removed', { kind: current.kind }, transaction)
  })
}

export async function restoreBlock(actor: Actor, block: Block) {
  const { sequelize } = useDb()
  if (!block.deletedAt) return describeBlock(block)
  const restored = await sequelize.transaction(async (transaction) => {
    const current = await lockBlockForChange(block, transaction, { includeRemoved: true })
    if (current.kind === 'prose') await assertNoBorrowedMarks(current.investigationId, current.id, current.content ?? undefined, transaction)
    await current.update({ deletedAt: null, updatedBy: actor.userId }, { transaction })
    await useDb().models.Investigation.increment('layoutVersion', { where: { id: block.investigationId }, transaction })
    await touchInvestigation(block.investigationId, actor.userId, transaction)
    await auditBlock(actor, current, 'block.restored', { kind: current.kind }, transaction)
    return current
  })
  return describeBlock(restored)
}

/** Puts the blocks in the given order; the list must name exactly the live blocks, at the current layout version. */
export async function reorderBlocks(actor: Actor, investigation: Investigation, layoutVersion: number, blockIds: string[]) {
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const locked = await models.Investigation.findByPk(investigation.id, { transaction, lock: transaction.LOCK.UPDATE })
    const blocks = await liveBlocks(investigation.id, transaction)
    const same = blocks.length === blockIds.length && blocks.every(b => blockIds.includes(b.id))
    if (!locked || locked.layoutVersion !== layoutVersion || !same) {
      throw fail(409, { message: 'The blocks were added, removed or moved by someone else. Reload to see the current order.' })
    }
    const byId = new Map(blocks.map(b => [b.id, b]))
    for (const [position, id] of blockIds.entries()) {
      const block = byId.get(id)!
      if (block.position !== position) await block.update({ position }, { transaction })
    }
    await locked.increment('layoutVersion', { transaction })
    await touchInvestigation(investigation.id, actor.userId, transaction)
    await recordAudit({
      newsroomId: investigation.newsroomId, investigationId: investigation.id, actorId: actor.userId, action: 'blocks.reordered',
      subjectType: 'investigation', subjectId: investigation.id, detail: { blockIds },
    }, transaction)
  })
  return describeInvestigation(await findInvestigation(investigation.id))
}
