import type { AnalysisSettings, ProseContent } from '#shared/types/investigation'
import { APPROVAL_LIMIT } from './payments'

const paragraph = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] })
const heading = (text: string) => ({ type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text }] })
const doc = (...content: object[]): ProseContent => ({ type: 'doc', content })

export type StoryBlock = { kind: 'prose', content: ProseContent } | { kind: 'analysis', settings: Omit<AnalysisSettings, 'datasetId'> }

/** The demo investigation's draft: invented prose around four analysis blocks. */
export const DEMO_STORY: StoryBlock[] = [
  {
    kind: 'prose',
    content: doc(
      paragraph('Port Averly City Council paid more than 24,000 supplier invoices in 2025, according to a payments ledger released to the Courier under the city\u2019s open-records rules.'),
      paragraph('Before we read a single invoice, we checked whether the amounts behave the way large sets of naturally occurring payments usually do.'),
    ),
  },
  { kind: 'analysis', settings: { column: 'amount', test: 'first-digit' } },
  {
    kind: 'prose',
    content: doc(
      heading('One supplier stands apart'),
      paragraph('Across the whole ledger the leading digits look ordinary. Split by supplier, one name ranks well above the rest.'),
    ),
  },
  { kind: 'analysis', settings: { column: 'amount', test: 'first-two-digits', groupBy: 'supplier' } },
  {
    kind: 'prose',
    content: doc(paragraph(`Council rules require a second signature on any payment of ${APPROVAL_LIMIT.toLocaleString('en-GB')} or more. Payments cluster just below that line.`)),
  },
  { kind: 'analysis', settings: { column: 'amount', test: 'threshold', threshold: APPROVAL_LIMIT } },
  { kind: 'analysis', settings: { column: 'amount', test: 'duplicates' } },
  {
    kind: 'prose',
    content: doc(paragraph('None of this shows wrongdoing. It tells us which invoices to request and which questions to put to the council and the supplier before anything is published.')),
  },
]
