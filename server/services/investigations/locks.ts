import type { Transaction } from 'sequelize'
import { formatDateTime } from '#shared/format/dates'
import type { ProseContent } from '#shared/types/investigation'
import { Op } from 'sequelize'
import type { Block, Claim } from '../../models'
import { userNames } from './catalog'
import { claimIdsIn, claimPassage } from './prose-claims'

function lockedError(by: string, at: Date, what: string) {
  return fail(423, {
    message: `${what} was locked by ${by} on ${formatDateTime(at)} after fact-checking. Ask a data editor to lift the lock if it must change.`,
    lockedBy: by, lockedAt: at.toISOString(),
  })
}

/**
 * 423 unless the save keeps every locked thing as it was: a locked block's settings, and a verified
 * claim's passage (from its first to its last marked character, as the public page draws it). The
 * passage is compared with the block as saved now, which the lock has kept since verification.
 */
export async function assertUnlocked(block: Block, change: { content?: ProseContent, settings?: unknown, removing?: boolean }, transaction?: Transaction) {
  if (block.lockedAt && (change.settings !== undefined || change.removing)) {
    const names = await userNames([block.lockedBy])
    throw lockedError(names.get(block.lockedBy ?? '') ?? 'a fact-checker', block.lockedAt, 'This analysis block')
  }
  if (block.kind !== 'prose' || (change.content === undefined && !change.removing)) return
  const verified = await useDb().models.Claim.findAll({ where: { blockId: block.id, status: 'verified' }, transaction })
  const broken = verified.find(claim => change.removing || claimPassage(change.content, claim.id) !== claimPassage(block.content, claim.id))
  if (broken) throw await claimLockedError(broken)
  if (change.content) await assertNoBorrowedMarks(block.investigationId, block.id, change.content, transaction)
}

async function claimLockedError(claim: Claim) {
  const names = await userNames([claim.decidedBy])
  return lockedError(names.get(claim.decidedBy ?? '') ?? 'a fact-checker', claim.decidedAt ?? new Date(), `The claim “${claim.quote.slice(0, 80)}”`)
}

/**
 * 423 when the text carries the mark of a verified claim of another block of the investigation: a
 * locked claim's mark stays on the passage that was checked and cannot be put on other text.
 */
export async function assertNoBorrowedMarks(investigationId: string, blockId: string | null, content: ProseContent | undefined, transaction?: Transaction) {
  const ids = [...claimIdsIn(content)].filter(id => UUID.test(id))
  if (!ids.length) return
  const borrowed = await useDb().models.Claim.findOne({
    where: { id: { [Op.in]: ids }, investigationId, status: 'verified', ...(blockId ? { blockId: { [Op.ne]: blockId } } : {}) },
    transaction,
  })
  if (borrowed) throw await claimLockedError(borrowed)
}

/** A claim id as the mark carries it; marks with anything else name no claim. */
export const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
