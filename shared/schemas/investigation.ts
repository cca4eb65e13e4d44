import { z } from './zod'
import { TEST_NAMES } from '../digits'
import { filterSchema, periodSchema } from './dataset'
import { oneLine } from './text'

export const investigationUpdateSchema = z.object({
  // One line: a title is shown in headings, lists and the published methodology.
  title: z.string().transform(oneLine).pipe(z.string().min(1, 'The title cannot be empty').max(300)).optional(),
  // The title version the new title was typed over (the investigation's `titleVersion`).
  titleVersion: z.number().int().positive().optional(),
  archived: z.boolean().optional(),
}).refine(v => v.title === undefined || v.titleVersion !== undefined, { path: ['titleVersion'], message: 'Name the title version you renamed from' })

const isRecord = (value: unknown): value is Record<string, unknown> => Boolean(value) && typeof value === 'object' && !Array.isArray(value)

/**
 * Whether every node has the shape the public page draws from (PublicationProse.vue) and the lock
 * check reads (prose-claims.ts): a string `type`, a string `text` on text nodes, children and marks
 * as lists. Anything else would be drawn otherwise than it is checked (a number as text is shown,
 * yet holds no words), or break the page. Walks without recursion; the body's depth is capped before.
 */
function wellFormedNodes(nodes: unknown[] | undefined): boolean {
  const stack: unknown[] = []
  for (const node of nodes ?? []) stack.push(node)
  while (stack.length) {
    const node = stack.pop()
    if (!isRecord(node) || typeof node.type !== 'string') return false
    if (node.type === 'text' && typeof node.text !== 'string') return false
    if (node.attrs !== undefined && !isRecord(node.attrs)) return false
    if (node.marks !== undefined && !(Array.isArray(node.marks) && node.marks.every(mark => isRecord(mark) && typeof mark.type === 'string' && (mark.attrs === undefined || isRecord(mark.attrs))))) return false
    if (node.content !== undefined) {
      if (!Array.isArray(node.content)) return false
      for (const child of node.content) stack.push(child)
    }
  }
  return true
}

/** Tiptap document JSON; its structure is checked here and when it is rendered, never trusted as HTML. */
export const proseContentSchema = z.object({
  type: z.literal('doc'),
  content: z.array(z.unknown()).max(5000).optional(),
}).refine(doc => wellFormedNodes(doc.content), 'This text is not in the editor\'s document form: every node needs a type, a text node its words as text, and children and marks come as lists')
  .refine(doc => JSON.stringify(doc).length <= 1_000_000, 'This block is too long: split it into several')

export const analysisSettingsSchema = z.object({
  datasetId: z.string().uuid().optional(),
  column: z.string().max(200).optional(),
  test: z.enum(TEST_NAMES).optional(),
  filters: z.array(filterSchema).max(10).optional(),
  groupBy: z.string().max(200).optional(),
  period: periodSchema.optional(),
  threshold: z.number().positive().finite().optional(),
  sign: z.enum(['positive', 'negative']).optional(),
})

/** A new draft; with `firstAnalysis` it starts with that analysis block after its empty paragraph. */
export const investigationCreateSchema = z.object({
  newsroomId: z.string().uuid(),
  title: z.string().transform(oneLine).pipe(z.string().min(1, 'Give the investigation a working title').max(300)),
  firstAnalysis: analysisSettingsSchema.optional(),
})

export const blockCreateSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('prose'), afterBlockId: z.string().uuid().nullable().optional(), content: proseContentSchema.optional() }),
  z.object({ kind: z.literal('analysis'), afterBlockId: z.string().uuid().nullable().optional(), settings: analysisSettingsSchema.optional() }),
])

export const blockUpdateSchema = z.object({
  version: z.number().int().positive(),
  content: proseContentSchema.optional(),
  settings: analysisSettingsSchema.optional(),
})

export const blockOrderSchema = z.object({
  layoutVersion: z.number().int().positive(),
  blockIds: z.array(z.string().uuid()).max(2000),
})

const note = z.string().trim().max(4000)

/** The API's old word for 'sent-back', still accepted from scripts until 2027-06-30 (README). */
const LEGACY_SENT_BACK = 'changes-requested'

export const reviewDecisionSchema = z.object({
  decision: z.enum(['approved', 'sent-back', LEGACY_SENT_BACK]).transform(d => (d === LEGACY_SENT_BACK ? 'sent-back' as const : d)),
  note: note.optional(),
  // The block's version the editor read; a block saved since answers 409.
  version: z.number().int().positive().optional(),
}).refine(v => v.decision === 'approved' || Boolean(v.note), { path: ['note'], message: 'Say what should change' })

export const claimCreateSchema = z.object({
  id: z.string().uuid(),
  blockId: z.string().uuid(),
  supportingBlockIds: z.array(z.string().uuid()).max(50).default([]),
})

// A claim's id is unique within its investigation; a member who holds the same id in two of them names one.
export const claimQuerySchema = z.object({ investigationId: z.string().uuid().optional() })

export const claimUpdateSchema = z.object({
  supportingBlockIds: z.array(z.string().uuid()).max(50),
})

// What the fact-checker read: the text block's version, or the passage word for word. Either one
// that no longer matches answers 409, so a passage changed after reading is never locked unread.
export const verifySchema = z.object({
  version: z.number().int().positive().optional(),
  quote: z.string().max(100_000).optional(),
}).refine(v => v.version !== undefined || v.quote !== undefined, { path: ['version'], message: 'Name the version of the text block you read (or the passage itself)' })

export const claimRemoveSchema = z.object({ reason: note.min(1).optional() })
export const disputeSchema = z.object({ note: note.min(1, 'Say what is wrong or missing') })
export const unlockSchema = z.object({ reason: note.min(1, 'Give the reason for lifting the lock; the audit trail keeps it') })
/** The account's e-mail settings; a request names one or both. */
export const preferencesSchema = z.object({ notifyByEmail: z.boolean().optional(), emailMentions: z.boolean().optional() })
  .refine(v => v.notifyByEmail !== undefined || v.emailMentions !== undefined, { path: ['notifyByEmail'], message: 'Name a setting to change' })

export const publishSchema = z.object({
  reason: note.optional(),
  // Publishing with a disputed claim is its own decision: the claims named and why, kept in the audit trail.
  disputed: z.object({
    claimIds: z.array(z.string().uuid()).min(1).max(500),
    reason: note.min(1, 'Say why these passages are published while disputed'),
  }).optional(),
  // The publisher confirms the follow-up statement; only then does the methodology print it.
  followUpConfirmed: z.boolean().optional(),
  expiresAt: z.string().datetime({ offset: true }).optional()
    .refine(v => !v || Date.parse(v) > Date.now(), 'Choose an expiry in the future'),
})

/** Filters and cursor of the audit trail; every field is optional, so new filters add fields, never break scripts. */
export const auditQuerySchema = z.object({
  before: z.string().regex(/^\d{1,18}$/, 'Use the `next` value of the page before').optional(),
  actor: z.string().uuid().optional(),
  kind: z.string().regex(/^[a-z-]+(\.[a-z-]+)?$/, 'An action such as claim.verified, or its family such as claim').max(80).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})
