import type { ProseContent } from '#shared/types/investigation'

interface Node { type?: string, text?: string, content?: Node[] }

/** The plain text of a prose block, for conflict notes and summaries. */
export function proseText(content: ProseContent | null | undefined): string {
  const walk = (node: Node): string => node.text ?? (node.content ?? []).map(walk).join(node.type === 'doc' ? '\n' : '')
  return content ? walk(content as Node).trim() : ''
}
