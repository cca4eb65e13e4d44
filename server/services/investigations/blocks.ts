import type { Transaction } from 'sequelize'
import type { z } from 'zod'
import type { blockCreateSchema, blockUpdateSchema } from '#shared/schemas/investigation'
import type { AnalysisSettings } from '#shared/types/investigation'
import type { Block, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { describeBlock, describeInvestigation, findInvestigation, liveBlocks, touchInvestigation } from './catalog'
import { assertUnlocked } from './locks'

/** The block behind an id with its investigation, for the permission check; 404 when missing or removed. */
export async function findBlock(id: string, { includeRemoved = false } = {}): Promise<{ block: Block, investigation: Investigation }> {
  const block = await useDb().models.Block.findByPk(id)
  if (!block || (block.deletedAt && !includeRemoved)) throw fail(404)
  return { block, investigation: await findInvestigation(block.investigationId) }
}

/** A block may only point at a dataset of its own newsroom. */
async function checkDataset(settings: AnalysisSettings | undefined, newsroomId: string) {
  if (!settings?.datasetId) return
  const dataset = await useDb().models.Dataset.findOne({ where: { id: settings.datasetId, newsroomId }, attributes: ['id'] })
  if (!dataset) throw fail(400, [{ path: 'settings.datasetId', message: 'Choose a dataset of this newsroom.' }])
}

export async function createBlock(actor: Actor, investigation: Investigation, input: z.output<typeof blockCreateSchema>) {
  const { sequelize, models } = useDb()
  if (input.kind === 'analysis') await checkDataset(input.settings, investigation.newsroomId)
  const block = await sequelize.transaction(async (transaction) => {
    await models.Investigation.findByPk(investigation.id, { transaction, lock: transaction.LOCK.UPDATE })
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
 * either comes before the save and is respected, or waits until the save is done.
 */
export async function updateBlock(actor: Actor, block: Block, input: z.output<typeof blockUpdateSchema>) {
  const { sequelize } = useDb()
  if (input.content && block.kind !== 'prose') throw fail(400, [{ path: 'content', message: 'Only prose blocks hold text.' }])
  if (input.settings && block.kind !== 'analysis') throw fail(400, [{ path: 'settings', message: 'Only analysis blocks hold settings.' }])
  await checkDataset(input.settings, (await findInvestigation(block.investigationId)).newsroomId)
  const outcome = await sequelize.transaction(async (transaction) => {
    const current = await lockBlockForChange(block, transaction)
    if (current.version !== input.version) return { stale: true, block: current }
    // jsonb hands keys back in its own order, so a plain string comparison would see a change in every resave.
    const settingsChanged = input.settings !== undefined && canonicalJson(input.settings) !== canonicalJson(current.settings)
    await assertUnlocked(current, { content: input.content, settings: settingsChanged ? input.settings : undefined }, transaction)
    // A reviewed method that changes needs a fresh review.
    const resetReview = settingsChanged && current.reviewStatus !== 'unreviewed'
    const was = current.reviewStatus
    await current.update({
      ...(input.content ? { content: input.content } : {}),
      ...(input.settings ? { settings: input.settings } : {}),
      ...(resetReview ? { reviewStatus: 'unreviewed' as const, reviewNote: null, reviewedBy: null, reviewedAt: null } : {}),
      version: input.version + 1,
      updatedBy: actor.userId,
    }, { transaction })
    if (resetReview) {
      await recordAudit({
        newsroomId: actor.newsroomId, investigationId: block.investigationId, actorId: actor.userId, action: 'review.reset',
        subjectType: 'block', subjectId: block.id, detail: { was, reason: 'settings changed' },
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
  })
}

export async function restoreBlock(actor: Actor, block: Block) {
  const { sequelize } = useDb()
  if (!block.deletedAt) return describeBlock(block)
  const restored = await sequelize.transaction(async (transaction) => {
    const current = await lockBlockForChange(block, transaction, { includeRemoved: true })
    await current.update({ deletedAt: null, updatedBy: actor.userId }, { transaction })
    await useDb().models.Investigation.increment('layoutVersion', { where: { id: block.investigationId }, transaction })
    await touchInvestigation(block.investigationId, actor.userId, transaction)
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
  })
  return describeInvestigation(await findInvestigation(investigation.id))
}
