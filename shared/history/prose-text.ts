import type { ProseContent } from '../types/investigation'

interface Node { type?: string, text?: string, content?: Node[] }

/** Nodes that hold words inline; every other node with content is a block and ends a line. */
const INLINE_PARENTS = new Set(['paragraph', 'heading', 'codeBlock'])

/**
 * The plain text of a prose block: the words of each paragraph, heading and list item on a line of
 * their own (a hard break too), so that the text of two versions can be compared word by word.
 */
export function proseText(content: ProseContent | null | undefined): string {
  const lines: string[] = []
  const walk = (node: Node) => {
    if (INLINE_PARENTS.has(node.type ?? '')) {
      lines.push((node.content ?? []).map(child => (child.type === 'hardBreak' ? '\n' : child.text ?? '')).join(''))
      return
    }
    if (node.text !== undefined) lines.push(node.text)
    for (const child of node.content ?? []) walk(child)
  }
  if (content) walk(content as Node)
  return lines.join('\n').trim()
}

/** The first words of a text, cut at a word near `length` characters. */
export function firstWords(text: string, length = 60): string {
  const line = text.replace(/\s+/g, ' ').trim()
  if (line.length <= length) return line
  const cut = line.lastIndexOf(' ', length)
  return `${line.slice(0, cut > length / 2 ? cut : length)}…`
}

/** The first heading's text, when the block has one. */
export function headingText(content: ProseContent | null | undefined): string | null {
  const heading = (content?.content as Node[] | undefined)?.find(node => node.type === 'heading')
  const text = heading ? proseText({ type: 'doc', content: [heading] }) : ''
  return text || null
}
