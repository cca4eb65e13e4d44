import { describe, expect, it } from 'vitest'
import { textDiff } from '../../../shared/history/text-diff'

// The texts are written here; what was kept, removed and added follows from them word for word.
// Whatever the pieces, the kept and removed ones must give the earlier text back exactly, and the
// kept and added ones the later (the property a reader relies on when the difference is drawn inline).

const earlier = (pieces: ReturnType<typeof textDiff>) => pieces.filter(p => p.change !== 'added').map(p => p.text).join('')
const later = (pieces: ReturnType<typeof textDiff>) => pieces.filter(p => p.change !== 'removed').map(p => p.text).join('')

describe('word differences', () => {
  it('marks one changed word between kept words', () => {
    const pieces = textDiff('The council paid the quick supplier twice.', 'The council paid the slow supplier twice.')
    expect(pieces).toEqual([
      { text: 'The council paid the ', change: 'same' },
      { text: 'quick', change: 'removed' },
      { text: 'slow', change: 'added' },
      { text: ' supplier twice.', change: 'same' },
    ])
  })

  it('keeps a rewritten run of words together instead of word by word', () => {
    const pieces = textDiff('Nine suppliers were paid in March.', 'Eleven firms got money in March.')
    expect(pieces).toEqual([
      { text: 'Nine suppliers were paid', change: 'removed' },
      { text: 'Eleven firms got money', change: 'added' },
      { text: ' in March.', change: 'same' },
    ])
  })

  it('gives both texts back exactly, line breaks included', () => {
    const cases: [string, string][] = [
      ['', 'A new paragraph.'],
      ['Gone entirely.', ''],
      ['One line.\nTwo lines.', 'One line.\nA second line.\nThree lines.'],
      ['Same text.', 'Same text.'],
      ['a b c d e f', 'f e d c b a'],
    ]
    for (const [a, b] of cases) {
      const pieces = textDiff(a, b)
      expect(earlier(pieces)).toBe(a)
      expect(later(pieces)).toBe(b)
    }
    expect(textDiff('', '')).toEqual([])
  })
})
