import { diffWordsWithSpace } from 'diff'
import type { TextPiece } from '../types/history'

/** Longest a word comparison may take before it settles for "all of it changed" (a million-character block). */
const DIFF_TIMEOUT_MS = 2000

/**
 * The word-level difference between two texts (the `diff` package's word comparison, spaces and
 * line breaks counted as words too, so that the kept and removed pieces give the earlier text
 * exactly and the kept and added ones the later). Neighbouring pieces of the same kind are joined.
 */
export function textDiff(before: string, after: string): TextPiece[] {
  if (before === after) return before ? [{ text: before, change: 'same' }] : []
  const changes = diffWordsWithSpace(before, after, { timeout: DIFF_TIMEOUT_MS })
    ?? [{ value: before, removed: true, added: false, count: 1 }, { value: after, added: true, removed: false, count: 1 }]
  const pieces: TextPiece[] = []
  for (const change of changes) {
    if (!change.value) continue
    const kind: TextPiece['change'] = change.added ? 'added' : change.removed ? 'removed' : 'same'
    const last = pieces.at(-1)
    if (last?.change === kind) last.text += change.value
    else pieces.push({ text: change.value, change: kind })
  }
  return pieces
}
