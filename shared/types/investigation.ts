import type { TestName, TestResult } from '../digits/types'
import type { DatasetFilter } from '../schemas/dataset'

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

export interface BlockDTO {
  id: string
  kind: 'prose' | 'analysis'
  position: number
  version: number
  content: ProseContent | null
  settings: AnalysisSettings | null
  updatedAt: string
  updatedBy: string | null
}

export interface InvestigationDTO extends InvestigationSummaryDTO {
  newsroomId: string
  layoutVersion: number
  blocks: BlockDTO[]
}

export interface AnalysisRunDTO {
  result: TestResult
  /** True when the result came from the cache of earlier runs with the same dataset and settings. */
  cached: boolean
}
