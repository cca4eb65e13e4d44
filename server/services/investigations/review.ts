import { Op } from 'sequelize'
import type { QueueItemDTO } from '#shared/types/investigation'
import { TEST_LABELS } from '#shared/charts/labels'
import type { Block, Investigation } from '../../models'
import type { Actor } from '../../utils/permissions'
import { lockBlockForChange } from './blocks'
import { describeBlock, describeInvestigation } from './catalog'
import { assertFourEyes } from './four-eyes'
import { investigationPath, subjectAnchor } from '#shared/conversation/anchor'
import { recordNotifications } from '../conversation/notifications'
import { describeThread, noteInThread } from '../conversation/threads'

/** The reporter asks the desk to review the method of every analysis block. */
export async function requestReview(actor: Actor, investigation: Investigation) {
  const { sequelize } = useDb()
  await sequelize.transaction(async (transaction) => {
    await investigation.update({ status: 'in-review', updatedBy: actor.userId }, { transaction })
    await recordAudit({ newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId, action: 'review.requested', subjectType: 'investigation', subjectId: investigation.id }, transaction)
    // The notice lands on the first method still waiting for review.
    const waiting = await useDb().models.Block.findOne({
      where: { investigationId: investigation.id, kind: 'analysis', deletedAt: null, reviewStatus: { [Op.ne]: 'approved' } }, order: [['position', 'ASC']], attributes: ['id'], transaction,
    })
    await recordNotifications(await membersWithRoles(actor.newsroomId, ['data-editor', 'admin']), {
      kind: 'review-requested', newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId,
      anchor: waiting ? subjectAnchor('review', waiting.id) : '',
    }, transaction)
  })
  await notifyUsers(await membersWithRoles(actor.newsroomId, ['data-editor', 'admin']), {
    subject: `Review requested: ${investigation.title}`,
    lines: [`${actor.name} asks for a review of the method of each analysis block in “${investigation.title}”.`],
    path: `/investigations/${investigation.id}`,
  }, actor.userId)
  return describeInvestigation(investigation)
}

/**
 * A data editor approves an analysis block's method or sends it back with a note. With `version`,
 * the decision holds only for the settings the editor saw: a block saved since answers 409 with
 * the block as it now is, so nobody approves settings they never read.
 */
export async function decideReview(actor: Actor, block: Block, investigation: Investigation, decision: 'approved' | 'sent-back', note?: string, version?: number) {
  if (block.kind !== 'analysis') throw fail(400, [{ path: 'decision', message: 'Only analysis blocks have a method to review.' }])
  const { sequelize } = useDb()
  const outcome = await sequelize.transaction(async (transaction) => {
    const current = await lockBlockForChange(block, transaction)
    if (version !== undefined && current.version !== version) return { stale: true, block: current, threadId: null }
    if (decision === 'approved') await assertFourEyes(actor, [current.createdBy, current.updatedBy], 'method', transaction)
    const at = new Date()
    // An approval keeps the settings it approved, so that settings changed and changed back can return it;
    // sending back forgets it.
    const approval = decision === 'approved'
      ? { approvedFingerprint: fingerprintOf(current.settings ?? {}), approvedSettings: current.settings ?? {}, approvedBy: actor.userId, approvedAt: at }
      : { approvedFingerprint: null, approvedSettings: null, approvedBy: null, approvedAt: null }
    await current.update({ reviewStatus: decision, reviewNote: note ?? null, reviewedBy: actor.userId, reviewedAt: at, ...approval }, { transaction })
    await recordAudit({
      newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId,
      action: decision === 'approved' ? 'block.approved' : 'block.sent-back', subjectType: 'block', subjectId: block.id,
      detail: { note: note ?? null, settings: current.settings },
    }, transaction)
    if (decision === 'sent-back') {
      // The note starts (or carries on) the review's conversation, where the reporter can answer it.
      const threadId = await noteInThread(actor, investigation, { type: 'review', id: current.id, blockId: current.id }, note!, 'sent-back', [investigation.createdBy], transaction)
      await recordNotifications([investigation.createdBy], {
        kind: 'sent-back', newsroomId: actor.newsroomId, investigationId: investigation.id, actorId: actor.userId,
        anchor: subjectAnchor('review', current.id), threadId, excerpt: note,
      }, transaction)
      return { stale: false, block: current, threadId }
    }
    return { stale: false, block: current, threadId: null }
  })
  if (outcome.stale) {
    throw fail(409, { message: 'The block was changed after you opened it. Read its settings again before deciding.', current: await describeBlock(outcome.block) })
  }
  const decided = outcome.block
  if (outcome.threadId) {
    await notifyUsers([investigation.createdBy], {
      subject: `Method sent back: ${investigation.title}`,
      lines: [`${actor.name} sent back an analysis block (${decided.settings?.test ? TEST_LABELS[decided.settings.test] : 'analysis'}) in “${investigation.title}”.`, `Their note: ${note}`],
      path: investigationPath(investigation.id, subjectAnchor('review', decided.id)),
    }, actor.userId)
    return { ...await describeBlock(decided), thread: await describeThread(outcome.threadId) }
  }
  return describeBlock(decided)
}

/** What waits for a data editor: analysis blocks of investigations in review that are not approved. */
export async function reviewQueue(newsroomId: string): Promise<QueueItemDTO[]> {
  const { models } = useDb()
  const investigations = await models.Investigation.findAll({ where: { newsroomId, status: 'in-review', archivedAt: null } })
  if (!investigations.length) return []
  const byId = new Map(investigations.map(i => [i.id, i]))
  const blocks = await models.Block.findAll({
    where: { investigationId: { [Op.in]: [...byId.keys()] }, kind: 'analysis', deletedAt: null, reviewStatus: { [Op.ne]: 'approved' } },
    order: [['investigationId', 'ASC'], ['position', 'ASC']],
  })
  return blocks.map(block => ({
    investigationId: block.investigationId,
    investigationTitle: byId.get(block.investigationId)!.title,
    blockId: block.id,
    label: `${block.settings?.test ? TEST_LABELS[block.settings.test] : 'Analysis'}${block.settings?.column ? ` of “${block.settings.column}”` : ''}`,
    status: block.reviewStatus,
    note: block.reviewNote ?? null,
    anchor: subjectAnchor('review', block.id),
  }))
}
