import type { MessagePartDTO } from '../types/conversation'

/** A message as one plain text, each mention as "@" and the member's name (e-mails, notification excerpts). */
export function messageText(parts: MessagePartDTO[]): string {
  return parts.map(p => (p.type === 'text' ? p.text : `@${p.name}`)).join('')
}
