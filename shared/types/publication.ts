import type { TestResult } from '../digits'
import type { AnalysisSettings, InvestigationStatus, ProseContent, Stamp } from './investigation'

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
  /** The first and last date of the dataset's date column, when the import read one (absent in older snapshots). */
  period?: { column: string, from: string, to: string } | null
}

export type PublishedBlock
  = | { kind: 'prose', content: ProseContent }
    | { kind: 'analysis', settings: AnalysisSettings, result: TestResult | null, summary: string }

/** What the record showed of the checks when the investigation was published. */
export interface PublishedChecks {
  methods: { approved: number, total: number }
  claims: { verified: number, disputed: number, total: number }
  /** True when every approval and verification was made by someone other than the author. */
  independent: boolean
}

/** What a public link shows, frozen at publication. */
export interface PublishedSnapshot {
  title: string
  newsroom: string
  publishedAt: string
  blocks: PublishedBlock[]
  datasets: DatasetFingerprint[]
  /** The methodology appendix, as Markdown. */
  methodology: string
  /**
   * Ids of the claims verified at publication: the only passages the public page marks. Snapshots
   * from before this field mark no passage at all.
   */
  verifiedClaims?: string[]
  checks?: PublishedChecks
}

export interface ShareLinkDTO {
  id: string
  publicationId: string
  publishedAt: string
  createdBy: string
  expiresAt: string | null
  revokedAt: string | null
  state: 'live' | 'withdrawn' | 'expired'
  /**
   * The public address, for members who may publish and only while the link is live; null otherwise,
   * and for a link whose token cannot be derived again (see `addressLost`).
   */
  url: string | null
  /** True for a live link whose address was made before links could be shown again, or under another server secret. */
  addressLost: boolean
  overrideReason: string | null
  /** The publisher's recorded decision to publish with disputed claims, when there were any. */
  disputedReason: string | null
  /** Who confirmed the follow-up statement printed in the methodology, when someone did. */
  followUpConfirmedBy: string | null
}

export interface PublishOutcomeDTO {
  /** The public address, with its token (derived again on request, never stored). */
  url: string
  link: ShareLinkDTO
}

/** What withdrawing a link answers: the link as it now is, and the investigation's status (back in review once no link is live). */
export interface WithdrawOutcomeDTO {
  ok: true
  link: ShareLinkDTO
  investigationStatus: InvestigationStatus
}

export interface PublishBlockerDTO {
  kind: 'unreviewed-block' | 'unverified-claim' | 'disputed-claim'
  /** The block or claim it concerns. */
  id: string
  label: string
}

/** One check and who did it, for the publishing panel. */
export interface PublishCheckDTO {
  kind: 'method' | 'claim'
  id: string
  label: string
  status: string
  /** Who made what is checked: the block's writer, the claim's marker. */
  author: string
  /** Who approved, sent back, verified or disputed it, and when. */
  decision: Stamp | null
}

export interface PublishingDTO {
  blockers: PublishBlockerDTO[]
  checks: PublishCheckDTO[]
  links: ShareLinkDTO[]
  /** The newsroom's four-eyes setting. */
  fourEyes: boolean
}
