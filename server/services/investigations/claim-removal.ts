import type { Claim } from '../../models'
import type { Actor } from '../../utils/permissions'
import { lockBlockForChange } from './blocks'
import { recordBlockVersion } from '../history/versions'
import { touchInvestigation } from './catalog'
import { claimText, filterClaimMarks } from './prose-claims'

/**
 * Takes a claim off its passage: the words stay in the text, the claim mark and the claim go, and
 * the audit trail keeps what it was (its words, status, note) with the reason given. An open claim
 * may be unmarked by whoever may mark it; a disputed one only by a data editor, with a reason
 * (the route checks the role); a verified one is locked until a data editor lifts the lock.
 */
export async function removeClaim(actor: Actor, claim: Claim, reason: string | undefined) {
  if (claim.status === 'verified') throw fail(423, { message: 'This claim is verified and locked. A data editor must lift the lock before it can be removed.' })
  if (claim.status === 'disputed' && !reason) throw fail(400, [{ path: 'reason', message: 'Give the reason for removing a disputed claim; the audit trail keeps it' }])
  const { sequelize, models } = useDb()
  await sequelize.transaction(async (transaction) => {
    const block = await models.Block.findByPk(claim.blockId, { transaction })
    if (block && !block.deletedAt) {
      const current = await lockBlockForChange(block, transaction)
      if (current.content && claimText(current.content, claim.id)) {
        await current.update({ content: filterClaimMarks(current.content, id => id !== claim.id), version: current.version + 1, updatedBy: actor.userId }, { transaction })
        await recordBlockVersion(current, 'claim-removed', transaction)
      }
    }
    await recordAudit({
      newsroomId: actor.newsroomId, investigationId: claim.investigationId, actorId: actor.userId,
      action: claim.status === 'open' && !reason ? 'claim.unmarked' : 'claim.removed', subjectType: 'claim', subjectId: claim.id,
      detail: { quote: claim.quote, status: claim.status, note: claim.note ?? null, reason: reason ?? null },
    }, transaction)
    await claim.destroy({ transaction })
    await touchInvestigation(claim.investigationId, actor.userId, transaction)
  })
}
