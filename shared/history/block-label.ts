import { TEST_LABELS } from '../charts/labels'
import type { AnalysisSettings, ProseContent } from '../types/investigation'
import { firstWords, headingText, proseText } from './prose-text'

export interface LabelledBlock {
  kind: 'prose' | 'analysis'
  content: ProseContent | null
  settings: AnalysisSettings | null
}

/** What a block says in a few words: its heading or first words, or its test and column. */
export function blockGist(block: LabelledBlock): string {
  if (block.kind === 'analysis') {
    const s = block.settings ?? {}
    return `${s.test ? TEST_LABELS[s.test] : 'Analysis not set up'}${s.column ? ` of “${s.column}”` : ''}`
  }
  const words = headingText(block.content) ?? proseText(block.content)
  return words ? `“${firstWords(words)}”` : 'empty text'
}

/**
 * A block as a reader of the trail or the history finds it: its place in the document (1 is the
 * first block) and what it says, or that it was removed.
 */
export function blockLabel(block: LabelledBlock, place: number | null): string {
  const gist = blockGist(block)
  const kind = block.kind === 'analysis' ? 'analysis' : 'text'
  return place === null ? `Removed ${kind} block, ${gist}` : `Block ${place} (${kind}), ${gist}`
}
