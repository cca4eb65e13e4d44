import type { RestoredBlockDTO } from '#shared/types/history'
import type { BlockDTO } from '#shared/types/investigation'
import type { Block } from '../../models'
import type { Actor } from '../../utils/permissions'
import { updateBlock } from '../investigations/blocks'
import { claimIdsIn, filterClaimMarks } from '../investigations/prose-claims'
import { UUID } from '../investigations/locks'
import { placeLabels } from './places'
import { versionSummary } from './versions'

/**
 * Brings an earlier version of a block back as a new save, named against `currentVersion` like any
 * save (409 when someone saved since). It follows every rule of a save: a verified claim's passage
 * or a locked block's settings answer 423, and changed settings send an approval back for review
 * (or bring back the approval they had). Marks of claims that no longer exist are left off the
 * restored text, so no claim comes back that was taken off.
 */
export async function restoreVersion(actor: Actor, block: Block, version: number, currentVersion: number): Promise<RestoredBlockDTO> {
  const saved = await saveVersionAgain(actor, block, version, currentVersion)
  const labels = await placeLabels(block.investigationId, [(await useDb().models.Block.findByPk(block.id))!])
  return { ...saved, saved: await versionSummary(block, saved.version), label: labels.get(block.id)! }
}

async function saveVersionAgain(actor: Actor, block: Block, version: number, currentVersion: number): Promise<BlockDTO> {
  const row = await useDb().models.BlockVersion.findOne({ where: { blockId: block.id, version } })
  if (!row) throw fail(404, { message: `This block has no version ${version}.` })
  if (block.kind === 'analysis') {
    if (canonicalJson(row.settings ?? {}) === canonicalJson(block.settings ?? {})) throw sameAsNow(version)
    return updateBlock(actor, block, { version: currentVersion, settings: row.settings ?? {} }, version)
  }
  const marked = [...claimIdsIn(row.content)]
  const existing = new Set(marked.length
    ? (await useDb().models.Claim.findAll({ where: { id: marked.filter(id => UUID.test(id)), blockId: block.id }, attributes: ['id'] })).map(c => c.id)
    : [])
  const content = filterClaimMarks(row.content ?? { type: 'doc', content: [] }, id => existing.has(id))
  if (canonicalJson(content) === canonicalJson(block.content)) throw sameAsNow(version)
  return updateBlock(actor, block, { version: currentVersion, content }, version)
}

function sameAsNow(version: number) {
  return fail(400, [{ path: 'version', message: `The block already reads as version ${version}: there is nothing to restore.` }])
}
