import { diffWordsWithSpace } from 'diff'
import type { TextPiece } from '../types/history'

/** Longest a word comparison may take before it settles for "all of it changed" (a million-character block). */
const DIFF_TIMEOUT_MS = 2000

interface Change { value: string, added?: boolean, removed?: boolean }

const isSame = (c: Change) => !c.added && !c.removed

/**
 * The word-level difference between two texts (the `diff` package's word comparison, spaces and
 * line breaks counted as words too, so that the kept and removed pieces give the earlier text
 * exactly and the kept and added ones the later). A lone space kept between two changes belongs to
 * the change, so a rewritten sentence reads as one removed run and one added run, not word by word.
 */
export function textDiff(before: string, after: string): TextPiece[] {
  if (before === after) return before ? [{ text: before, change: 'same' }] : []
  const changes: Change[] = diffWordsWithSpace(before, after, { timeout: DIFF_TIMEOUT_MS })
    ?? [{ value: before, removed: true }, { value: after, added: true }]
  const pieces: TextPiece[] = []
  // Consecutive changes gather here, the removed text and the added text each in order.
  let removed = ''
  let added = ''
  const flush = () => {
    if (removed) pieces.push({ text: removed, change: 'removed' })
    if (added) pieces.push({ text: added, change: 'added' })
    removed = added = ''
  }
  changes.forEach((change, i) => {
    if (!change.value) return
    const between = isSame(change) && /^\s+$/.test(change.value) && (removed || added) && changes[i + 1] && !isSame(changes[i + 1]!)
    if (change.removed || between) removed += change.value
    if (change.added || between) added += change.value
    if (isSame(change) && !between) {
      flush()
      const last = pieces.at(-1)
      if (last?.change === 'same') last.text += change.value
      else pieces.push({ text: change.value, change: 'same' })
    }
  })
  flush()
  return pieces
}
