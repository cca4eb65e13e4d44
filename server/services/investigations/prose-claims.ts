import type { ProseContent } from '#shared/types/investigation'

interface Node { type?: string, text?: string, marks?: { type: string, attrs?: Record<string, unknown> }[], content?: Node[] }

/** The text a claim mark covers in a prose block's document; '' when the mark is gone. */
export function claimText(content: ProseContent | null | undefined, claimId: string): string {
  let text = ''
  const walk = (node: Node) => {
    if (node.text && node.marks?.some(m => m.type === 'claim' && m.attrs?.claimId === claimId)) text += node.text
    node.content?.forEach(walk)
  }
  if (content) walk(content as Node)
  return text
}

/**
 * The document with only the claim marks whose id passes `keep`; the words of the others stay, as
 * plain text.
 */
export function filterClaimMarks(content: ProseContent, keep: (claimId: string) => boolean): ProseContent {
  const strip = (node: Node): Node => ({
    ...node,
    ...(node.marks ? { marks: node.marks.filter(m => m.type !== 'claim' || keep(String(m.attrs?.claimId))) } : {}),
    ...(node.content ? { content: node.content.map(strip) } : {}),
  })
  return strip(content as Node) as ProseContent
}

interface ClaimInBlock { id: string, blockId: string }
interface ProseBlockLike { id: string, content: ProseContent | null, deletedAt?: Date | null }

/**
 * The claims whose passage is still in a live block, each with the passage's words as they stand
 * now. A claim whose words were deleted (or whose block was removed) is left out: it never reaches
 * the margin, a queue or the publishing checklist, and comes back if an undo brings the words back.
 */
export function attachedClaims<C extends ClaimInBlock>(claims: C[], blocks: ProseBlockLike[]): { claim: C, quote: string }[] {
  const byId = new Map(blocks.filter(b => !b.deletedAt).map(b => [b.id, b]))
  return claims.flatMap((claim) => {
    const block = byId.get(claim.blockId)
    const quote = block ? claimText(block.content, claim.id) : ''
    return quote.trim() ? [{ claim, quote }] : []
  })
}
