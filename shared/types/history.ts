import type { AnalysisSettings, BlockDTO, ProseContent } from './investigation'

/**
 * How a block version came about: `recorded` is the state a block had when Mantissa began keeping
 * versions (nothing earlier is known), `claim-removed` a claim's mark taken off its words.
 */
export type BlockVersionChange = 'recorded' | 'created' | 'edited' | 'restored' | 'claim-removed'

/** A block as a publication froze it: which block, at which of its versions. */
export interface FrozenBlock {
  blockId: string
  version: number
}

export interface BlockVersionSummaryDTO {
  version: number
  change: BlockVersionChange
  /** For a restore: the version whose state was brought back. */
  restoredFrom: number | null
  savedBy: string | null
  savedAt: string
  /** The first words of the text, or the test and column: enough to tell versions apart in a list. */
  summary: string
}

export interface BlockVersionDTO extends BlockVersionSummaryDTO {
  kind: 'prose' | 'analysis'
  content: ProseContent | null
  settings: AnalysisSettings | null
}

/** What a restore answers: the block as saved, the version the save added to its history, and the block's label as it now reads. */
export interface RestoredBlockDTO extends BlockDTO {
  saved: BlockVersionSummaryDTO
  label: string
}

export interface BlockHistoryDTO {
  blockId: string
  investigationId: string
  kind: 'prose' | 'analysis'
  /** Where the block stands ("Block 3 · “Payments…”"), or that it was removed. */
  label: string
  removed: boolean
  /** The block's current version: a restore names it, like any save. */
  version: number
  /** Newest first. */
  versions: BlockVersionSummaryDTO[]
}

/** A run of text that both versions share, or that only the later (added) or earlier (removed) one has. */
export interface TextPiece {
  text: string
  change: 'same' | 'added' | 'removed'
}

/** One analysis setting in two states, in words. */
export interface SettingChange {
  field: string
  label: string
  before: string | null
  after: string | null
  changed: boolean
}

/** What differs between two states of a block: words for prose, fields for analysis settings. */
export interface StateDiff {
  kind: 'prose' | 'analysis'
  /** False when the two states are the same. */
  changed: boolean
  /** Prose: the text, piece by piece. */
  text: TextPiece[] | null
  /** Prose: true when the words are the same and only formatting or claim marks differ. */
  sameWords: boolean
  /** Analysis: every setting, the changed ones marked. */
  settings: SettingChange[] | null
}

export interface BlockDiffDTO extends StateDiff {
  from: BlockVersionSummaryDTO
  to: BlockVersionSummaryDTO
}

export interface PublishedChangeDTO {
  /** Null for a block of an older publication that no block of the draft matches by id. */
  blockId: string | null
  label: string
  change: 'added' | 'removed' | 'changed'
  diff: StateDiff | null
}

export interface PublicationChangesDTO {
  publicationId: string
  publishedAt: string
  /** How the published blocks were matched to the draft's: by their ids and versions, or (older publications) by content and order. */
  matchedBy: 'version' | 'content'
  changes: PublishedChangeDTO[]
  /** Blocks that read as they were published. */
  unchanged: number
}
