import { blockLabel } from '#shared/history/block-label'
import type { Block } from '../../models'
import { liveBlocks } from '../investigations/catalog'

/**
 * Labels for blocks as they stand now: their place among the investigation's live blocks (1 is
 * the first) and what they say; a removed block says so. Answers a label for every block given.
 */
export async function placeLabels(investigationId: string, blocks: Block[]): Promise<Map<string, string>> {
  const live = await liveBlocks(investigationId)
  const place = new Map(live.map((b, i) => [b.id, i + 1]))
  return new Map(blocks.map(b => [b.id, blockLabel(b, b.deletedAt ? null : place.get(b.id) ?? null)]))
}
