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
