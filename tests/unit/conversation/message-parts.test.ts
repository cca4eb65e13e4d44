import { describe, expect, it } from 'vitest'
import { matchingMembers, mentionQuery, messageParts } from '#shared/conversation/message-parts'
import { messageText } from '#shared/conversation/message-text'

// docs/product-rules.md ("Conversations and notifications"): a mention is stored as the member's id, not as text to read again. These cases are
// worked out by hand from the rule in message-parts.ts (no outside table applies to them).
const ann = { userId: '00000000-0000-4000-8000-000000000001', name: 'Ann' }
const annLee = { userId: '00000000-0000-4000-8000-000000000002', name: 'Ann Lee' }

describe('messageParts', () => {
  it('keeps plain text as one part', () => {
    expect(messageParts('No mention here.', [])).toEqual([{ type: 'text', text: 'No mention here.' }])
  })

  it('turns each chosen "@Name" into its member\'s id, wherever it stands', () => {
    expect(messageParts('@Ann, see @Ann Lee.', [ann, annLee])).toEqual([
      { type: 'mention', userId: ann.userId }, { type: 'text', text: ', see ' }, { type: 'mention', userId: annLee.userId }, { type: 'text', text: '.' },
    ])
  })

  it('leaves an "@" that names nobody chosen as text, and a mention edited away as text', () => {
    expect(messageParts('mail a@b.example or @Bob', [ann])).toEqual([{ type: 'text', text: 'mail a@b.example or @Bob' }])
    expect(messageParts('@An was typed over', [ann])).toEqual([{ type: 'text', text: '@An was typed over' }])
  })

  it('reads back as the text typed', () => {
    const typed = 'Hi @Ann Lee and @Ann: the total <b>is</b> 1,204.50'
    const parts = messageParts(typed, [ann, annLee])
    const names = new Map([[ann.userId, ann.name], [annLee.userId, annLee.name]])
    expect(messageText(parts.map(p => (p.type === 'text' ? p : { ...p, name: names.get(p.userId)! })))).toBe(typed)
  })
})

describe('mentionQuery', () => {
  it('finds the "@" query before the caret at the start or after a space', () => {
    expect(mentionQuery('@An', 3)).toEqual({ start: 0, query: 'An' })
    expect(mentionQuery('ask @ann l', 10)).toEqual({ start: 4, query: 'ann l' })
  })

  it('is not a query inside an address or after the caret moved on a line', () => {
    expect(mentionQuery('mail a@b', 8)).toBeNull()
    expect(mentionQuery('@Ann\nnext', 9)).toBeNull()
  })
})

describe('matchingMembers', () => {
  const members = [{ name: 'Ann Lee' }, { name: 'Bo Ängström' }, { name: 'Cy Annan' }]
  it('matches the start of the name or of any word in it, ignoring case and accents', () => {
    expect(matchingMembers(members, 'ann').map(m => m.name)).toEqual(['Ann Lee', 'Cy Annan'])
    expect(matchingMembers(members, 'ang').map(m => m.name)).toEqual(['Bo Ängström'])
    expect(matchingMembers(members, '').map(m => m.name)).toEqual(['Ann Lee', 'Bo Ängström', 'Cy Annan'])
  })
})
