import type { TestResult } from '../digits'
import type { AnalysisSettings, ProseContent } from './investigation'

/** A dataset as the public page describes it: enough to identify the exact file used. */
export interface DatasetFingerprint {
  id: string
  title: string
  sha256: string
  rowCount: number | null
  obtainedOn: string | null
  sourceNote: string | null
  sourceUrl: string | null
  originalName: string
}

export type PublishedBlock
  = | { kind: 'prose', content: ProseContent }
    | { kind: 'analysis', settings: AnalysisSettings, result: TestResult | null, summary: string }

/** What a public link shows, frozen at publication. */
export interface PublishedSnapshot {
  title: string
  newsroom: string
  publishedAt: string
  blocks: PublishedBlock[]
  datasets: DatasetFingerprint[]
  /** The methodology appendix, as Markdown. */
  methodology: string
}

export interface ShareLinkDTO {
  id: string
  publicationId: string
  publishedAt: string
  createdBy: string
  expiresAt: string | null
  revokedAt: string | null
  overrideReason: string | null
}

export interface PublishOutcomeDTO {
  /** The public address, with its token: shown this once and never stored. */
  url: string
  link: ShareLinkDTO
}

export interface PublishBlockerDTO {
  kind: 'unreviewed-block' | 'unverified-claim'
  label: string
}
