import type { MessagePart } from '../types/conversation'

export interface ChosenMention { userId: string, name: string }

/**
 * Turns what was typed in the message box into parts: every "@Name" of a member chosen from the
 * picker becomes a mention of their id; everything else, another "@" included, stays text. A
 * mention whose name was edited away is simply text now. Longer names win where one name starts
 * another ("@Ann" and "@Ann Lee").
 */
export function messageParts(text: string, chosen: ChosenMention[]): MessagePart[] {
  const tokens = [...new Map(chosen.map(c => [c.userId, c])).values()]
    .map(c => ({ userId: c.userId, token: `@${c.name}` }))
    .sort((a, b) => b.token.length - a.token.length)
  const parts: MessagePart[] = []
  let plain = ''
  let at = 0
  while (at < text.length) {
    const found = text[at] === '@' ? tokens.find(t => text.startsWith(t.token, at)) : undefined
    if (found) {
      if (plain) parts.push({ type: 'text', text: plain })
      parts.push({ type: 'mention', userId: found.userId })
      plain = ''
      at += found.token.length
    }
    else {
      plain += text[at]
      at += 1
    }
  }
  if (plain) parts.push({ type: 'text', text: plain })
  return parts
}

/** The "@query" being typed just before the caret, or null when the caret is not in one. */
export function mentionQuery(text: string, caret: number): { start: number, query: string } | null {
  const match = /(?:^|\s)@([^@\n]{0,40})$/.exec(text.slice(0, caret))
  if (!match) return null
  return { start: caret - match[1]!.length - 1, query: match[1]! }
}

/** Members whose name, or a word of it, starts with the query (case and accents aside). */
export function matchingMembers<M extends { name: string }>(members: M[], query: string, limit = 6): M[] {
  const fold = (s: string) => s.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase()
  const q = fold(query.trimStart())
  return members.filter((m) => {
    const name = fold(m.name)
    return name.startsWith(q) || name.split(/\s+/).some(word => word.startsWith(q))
  }).slice(0, limit)
}
