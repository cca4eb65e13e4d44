import type { Transaction } from 'sequelize'
import { formatDateTime } from '#shared/format/dates'
import type { ProseContent } from '#shared/types/investigation'
import type { Block } from '../../models'
import { userNames } from './catalog'
import { claimText } from './prose-claims'

function lockedError(by: string, at: Date, what: string) {
  return fail(423, {
    message: `${what} was locked by ${by} on ${formatDateTime(at)} after fact-checking. Ask a data editor to lift the lock if it must change.`,
    lockedBy: by, lockedAt: at.toISOString(),
  })
}

/** 423 unless the save keeps every locked thing as it was: a locked block's settings, a verified claim's text. */
export async function assertUnlocked(block: Block, change: { content?: ProseContent, settings?: unknown, removing?: boolean }, transaction?: Transaction) {
  if (block.lockedAt && (change.settings !== undefined || change.removing)) {
    const names = await userNames([block.lockedBy])
    throw lockedError(names.get(block.lockedBy ?? '') ?? 'a fact-checker', block.lockedAt, 'This analysis block')
  }
  if (block.kind !== 'prose' || (change.content === undefined && !change.removing)) return
  const verified = await useDb().models.Claim.findAll({ where: { blockId: block.id, status: 'verified' }, transaction })
  const broken = verified.find(claim => change.removing || claimText(change.content, claim.id) !== claim.quote)
  if (broken) {
    const names = await userNames([broken.decidedBy])
    throw lockedError(names.get(broken.decidedBy ?? '') ?? 'a fact-checker', broken.decidedAt ?? new Date(), `The claim “${broken.quote.slice(0, 80)}”`)
  }
}
