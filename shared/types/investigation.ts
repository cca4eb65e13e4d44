import type { TestName, TestResult } from '../digits'
import type { DatasetFilter } from '../schemas/dataset'
import type { Period } from '../dates/read-date'

/** A prose block's rich text, as Tiptap's document JSON. */
export interface ProseContent {
  type: 'doc'
  content?: unknown[]
}

/** What an analysis block runs; every field may still be empty while the reporter sets it up. */
export interface AnalysisSettings {
  datasetId?: string
  column?: string
  test?: TestName
  filters?: DatasetFilter[]
  groupBy?: string
  period?: Period
  threshold?: number
  sign?: 'positive' | 'negative'
}

export type InvestigationStatus = 'draft' | 'in-review' | 'published'

export interface InvestigationSummaryDTO {
  id: string
  title: string
  status: InvestigationStatus
  createdBy: string
  createdById: string
  updatedBy: string | null
  updatedAt: string
  archived: boolean
}

export type ReviewStatus = 'unreviewed' | 'approved' | 'sent-back'
export type ClaimStatus = 'open' | 'verified' | 'disputed'

/** Who did something and when: locks and reviews carry one. */
export interface Stamp {
  by: string
  at: string
}

export interface BlockDTO {
  id: string
  kind: 'prose' | 'analysis'
  position: number
  version: number
  content: ProseContent | null
  settings: AnalysisSettings | null
  updatedAt: string
  updatedBy: string | null
  /** Analysis blocks only: the data editor's verdict on the method. */
  review: {
    status: ReviewStatus
    note: string | null
    stamp: Stamp | null
    /** An approval set aside because the settings changed; saving `settings` again brings it back. */
    lapsed: { stamp: Stamp, settings: AnalysisSettings } | null
  } | null
  /** Set while a verified claim cites this analysis block: its settings cannot change. */
  lock: Stamp | null
}

export interface ClaimDTO {
  id: string
  blockId: string
  quote: string
  supportingBlockIds: string[]
  status: ClaimStatus
  note: string | null
  createdBy: string
  decision: Stamp | null
}

export interface AuditEventDTO {
  id: string
  action: string
  actor: string | null
  actorId: string | null
  subjectType: string
  subjectId: string | null
  detail: Record<string, unknown>
  at: string
  /** The block the event concerns, as it stands now ("Block 3 (text), “Payments…”"), or null. */
  block: string | null
  /** The claim's quoted words, when the event concerns a claim. */
  claim: string | null
  /** What changed, old → new: settings fields, a title, a role, a review. */
  changes: { label: string, from: string | null, to: string | null }[]
}

/** One page of an audit trail, newest first; `next` goes in `before` for the page after it. */
export interface AuditPageDTO {
  events: AuditEventDTO[]
  next: string | null
}

export interface QueueItemDTO {
  investigationId: string
  investigationTitle: string
  blockId: string
  label: string
  status: ReviewStatus | ClaimStatus
  note: string | null
  /** Where in the investigation it is: subjectAnchor() of the review or the claim. */
  anchor: string
}

export interface InvestigationDTO extends InvestigationSummaryDTO {
  newsroomId: string
  layoutVersion: number
  /** The title's edit version: a title save names it, and a stale one answers 409. */
  titleVersion: number
  blocks: BlockDTO[]
  claims: ClaimDTO[]
}

export interface AnalysisRunDTO {
  result: TestResult
  /** True when the result came from the cache of earlier runs with the same dataset and settings. */
  cached: boolean
}
