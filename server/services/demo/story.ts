import type { AnalysisSettings, ProseContent } from '#shared/types/investigation'
import { APPROVAL_LIMIT } from './payments'

type Inline = string | { claim: string, text: string }
const inline = (part: Inline) => (typeof part === 'string'
  ? { type: 'text', text: part }
  : { type: 'text', text: part.text, marks: [{ type: 'claim', attrs: { claimId: part.claim } }] })
const paragraph = (...parts: Inline[]) => ({ type: 'paragraph', content: parts.map(inline) })
const heading = (text: string) => ({ type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text }] })
const doc = (...content: object[]): ProseContent => ({ type: 'doc', content })

/** The demo's claims, one in each state, with the analysis blocks (by position in DEMO_STORY) they rest on. */
export const DEMO_CLAIMS = {
  verified: { id: '5b1f0c1e-8a4d-4c2e-9f3a-1d2e3f4a5b60', cites: [1] },
  disputed: { id: '6c2a1d2f-9b5e-4d3f-8a4b-2e3f4a5b6c71', cites: [3] },
  open: { id: '7d3b2e3a-8c6f-4e4a-9b5c-3f4a5b6c7d82', cites: [5] },
} as const

export type StoryBlock = { kind: 'prose', content: ProseContent } | { kind: 'analysis', settings: Omit<AnalysisSettings, 'datasetId'> }

/** The demo investigation's draft: invented prose around four analysis blocks. */
export const DEMO_STORY: StoryBlock[] = [
  {
    kind: 'prose',
    content: doc(
      paragraph({ claim: DEMO_CLAIMS.verified.id, text: 'Port Averly City Council paid more than 24,000 supplier invoices in 2025' }, ', according to a payments ledger released to the Courier under the city\u2019s open-records rules.'),
      paragraph('Before we read a single invoice, we checked whether the amounts behave the way large sets of naturally occurring payments usually do.'),
    ),
  },
  { kind: 'analysis', settings: { column: 'amount', test: 'first-digit' } },
  {
    kind: 'prose',
    content: doc(
      heading('One supplier stands apart'),
      paragraph('Across the whole ledger the leading digits look ordinary. ', { claim: DEMO_CLAIMS.disputed.id, text: 'Split by supplier, one name ranks well above the rest.' }),
    ),
  },
  // First digit by supplier: the planted supplier's 600 payments are under the 939 values the first-two test needs to be read.
  { kind: 'analysis', settings: { column: 'amount', test: 'first-digit', groupBy: 'supplier' } },
  {
    kind: 'prose',
    content: doc(paragraph(`Council rules require a second signature on any payment of ${APPROVAL_LIMIT.toLocaleString('en-GB')} or more. `, { claim: DEMO_CLAIMS.open.id, text: 'Payments cluster just below that line.' })),
  },
  { kind: 'analysis', settings: { column: 'amount', test: 'threshold', threshold: APPROVAL_LIMIT } },
  { kind: 'analysis', settings: { column: 'amount', test: 'duplicates' } },
  {
    kind: 'prose',
    content: doc(paragraph('None of this shows wrongdoing. It tells us which invoices to request and which questions to put to the council and the supplier before anything is published.')),
  },
]

/** Written after the first publication: the draft moves on while the public page stays frozen. */
export const DEMO_FOLLOW_UP: ProseContent = doc(
  heading('Still to do before the next version'),
  paragraph('The council\u2019s finance office has been asked for the approval records of every invoice between 24,000 and 25,000. Its answer goes here, and back to the desk for review, before this page is published again.'),
)
