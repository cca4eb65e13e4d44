import type { ProseContent } from '#shared/types/investigation'

interface Mark { type: string, attrs?: Record<string, unknown> }
interface Node { type?: string, text?: string, marks?: Mark[], attrs?: Record<string, unknown>, content?: Node[] }

/** One piece of a document as the public page draws it (PublicationProse.vue): text with its styles, or a tag opening or closing. */
type Piece
  = | { kind: 'text', text: string, style: string, claims: Set<string> }
    | { kind: 'open' | 'close', tag: string }

const DRAWN_TAGS: Record<string, string> = { paragraph: 'p', bulletList: 'ul', orderedList: 'ol', listItem: 'li', blockquote: 'blockquote', hardBreak: 'br' }

function tagOf(node: Node): string {
  if (node.type === 'heading') return Number(node.attrs?.level) === 3 ? 'h3' : 'h2'
  return DRAWN_TAGS[node.type ?? ''] ?? 'div'
}

/** The styles the page draws for a text's marks (claim marks apart): what a reader sees change. */
function styleOf(marks: Mark[]): string {
  return marks.filter(m => m.type !== 'claim').map((m) => {
    if (m.type === 'link') {
      const href = String(m.attrs?.href ?? '')
      return `link:${/^(https?:|mailto:)/i.test(href) ? href : ''}`
    }
    return m.type === 'bold' || m.type === 'italic' ? m.type : ''
  }).filter(Boolean).sort().join(' ')
}

/**
 * The document as the page draws it. Only nodes of type "text" draw text (a `text` field on any
 * other node is never shown), and neighbouring texts with the same styles and claims are joined,
 * so that two documents the page draws alike give the same pieces.
 */
function drawnPieces(content: ProseContent | null | undefined): Piece[] {
  const pieces: Piece[] = []
  const walk = (node: Node) => {
    if (node.type === 'text') {
      if (!node.text) return
      const marks = Array.isArray(node.marks) ? node.marks : []
      const claims = new Set(marks.filter(m => m.type === 'claim' && typeof m.attrs?.claimId === 'string').map(m => m.attrs!.claimId as string))
      const style = styleOf(marks)
      const last = pieces.at(-1)
      if (last?.kind === 'text' && last.style === style && sameSet(last.claims, claims)) last.text += node.text
      else pieces.push({ kind: 'text', text: String(node.text), style, claims })
      return
    }
    const tag = tagOf(node)
    pieces.push({ kind: 'open', tag })
    if (Array.isArray(node.content)) node.content.forEach(walk)
    pieces.push({ kind: 'close', tag })
  }
  if (content && Array.isArray(content.content)) (content.content as Node[]).forEach(walk)
  return pieces
}

function sameSet(a: Set<string>, b: Set<string>) {
  return a.size === b.size && [...a].every(x => b.has(x))
}

/** The pieces from the first to the last text that carries the claim's mark; [] when the mark is gone. */
function passagePieces(content: ProseContent | null | undefined, claimId: string): Piece[] {
  const pieces = drawnPieces(content)
  const marked = (p: Piece) => p.kind === 'text' && p.claims.has(claimId)
  const first = pieces.findIndex(marked)
  if (first < 0) return []
  const last = pieces.findLastIndex(marked)
  return pieces.slice(first, last + 1)
}

/**
 * The claim's passage as a reader sees it: everything from its first to its last marked
 * character, unmarked words between the marked pieces included, a break between blocks as a new line.
 */
export function claimText(content: ProseContent | null | undefined, claimId: string): string {
  let text = ''
  let broken = false
  for (const piece of passagePieces(content, claimId)) {
    if (piece.kind !== 'text') broken = true
    else {
      if (broken && text) text += '\n'
      text += piece.text
      broken = false
    }
  }
  return text
}

/**
 * A fingerprint of the passage as the page draws it: its texts, their styles, which of them the
 * claim's mark covers and the block structure between them. A locked claim keeps it unchanged.
 */
export function claimPassage(content: ProseContent | null | undefined, claimId: string): string {
  return JSON.stringify(passagePieces(content, claimId).map(piece => piece.kind === 'text'
    ? ['t', piece.text, piece.style, piece.claims.has(claimId)]
    : [piece.kind, piece.tag]))
}

/** Every claim id whose mark appears in the document. */
export function claimIdsIn(content: ProseContent | null | undefined): Set<string> {
  const ids = new Set<string>()
  for (const piece of drawnPieces(content)) if (piece.kind === 'text') piece.claims.forEach(id => ids.add(id))
  return ids
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
