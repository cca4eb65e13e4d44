import { Mark, mergeAttributes } from '@tiptap/vue-3'
import type { Node as ProseNode } from '@tiptap/pm/model'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { Decoration, DecorationSet } from '@tiptap/pm/view'
import { formatDateTime } from '#shared/format/dates'
import type { ClaimStatus } from '#shared/types/investigation'

export interface ClaimMarkOptions {
  /** The status of each claim in this block, read whenever the editor redraws. */
  statusOf: () => Map<string, ClaimStatus>
  /** Told which locked claim an edit tried to change, so the editor can say so where the caret is. */
  onRefused: (claimId: string) => void
  /** The claim a link points at, drawn highlighted. */
  targetOf: () => string | null
}

function claimTextIn(doc: ProseNode, claimId: string): string {
  let text = ''
  doc.descendants((node) => {
    if (node.isText && node.marks.some(m => m.type.name === 'claim' && m.attrs.claimId === claimId)) text += node.text
  })
  return text
}

/**
 * A passage marked as a claim. Verified claims are locked: any edit that would change their
 * text is refused in the editor (the server refuses it too, with 423).
 */
export const ClaimMark = Mark.create<ClaimMarkOptions>({
  name: 'claim',
  inclusive: false,
  excludes: '',
  addOptions() {
    return { statusOf: () => new Map(), onRefused: () => {}, targetOf: () => null }
  },
  addAttributes() {
    return {
      claimId: {
        default: null,
        parseHTML: element => element.getAttribute('data-claim'),
        renderHTML: attributes => ({ 'data-claim': attributes.claimId }),
      },
    }
  },
  parseHTML() {
    return [{ tag: 'span[data-claim]' }]
  },
  renderHTML({ HTMLAttributes }) {
    return ['span', mergeAttributes(HTMLAttributes, { class: 'claim' }), 0]
  },
  addProseMirrorPlugins() {
    const { statusOf, onRefused, targetOf } = this.options
    return [new Plugin({
      key: new PluginKey('claim-lock'),
      filterTransaction(transaction, state) {
        if (!transaction.docChanged) return true
        for (const [id, status] of statusOf()) {
          if (status === 'verified' && claimTextIn(state.doc, id) !== claimTextIn(transaction.doc, id)) {
            onRefused(id)
            return false
          }
        }
        return true
      },
      props: {
        decorations(state) {
          const statuses = statusOf()
          const target = targetOf()
          const decorations: Decoration[] = []
          state.doc.descendants((node, position) => {
            const mark = node.isText ? node.marks.find(m => m.type.name === 'claim') : undefined
            if (mark) decorations.push(Decoration.inline(position, position + node.nodeSize, { class: `claim-${statuses.get(mark.attrs.claimId) ?? 'open'}${mark.attrs.claimId === target ? ' claim-target' : ''}` }))
          })
          return DecorationSet.create(state.doc, decorations)
        },
      },
    })]
  },
})

/** What the editor says when an edit would change a verified claim: who locked it, when, and what to do. */
export function lockedPassageText(claim: { decision: { by: string, at: string } | null } | undefined, mayLift: boolean): string {
  const who = claim?.decision ? `${claim.decision.by} verified it on ${formatDateTime(claim.decision.at)}` : 'a fact-checker verified it'
  const next = mayLift ? 'To change it, lift the lock in the margin; the audit trail keeps your reason.' : 'To change it, ask a data editor to lift the lock.'
  return `This passage is locked: ${who}. ${next}`
}
