import { Mark, mergeAttributes } from '@tiptap/vue-3'
import type { Node as ProseNode } from '@tiptap/pm/model'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { Decoration, DecorationSet } from '@tiptap/pm/view'
import type { ClaimStatus } from '#shared/types/investigation'

export interface ClaimMarkOptions {
  /** The status of each claim in this block, read whenever the editor redraws. */
  statusOf: () => Map<string, ClaimStatus>
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
    return { statusOf: () => new Map() }
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
    const statusOf = this.options.statusOf
    return [new Plugin({
      key: new PluginKey('claim-lock'),
      filterTransaction(transaction, state) {
        if (!transaction.docChanged) return true
        for (const [id, status] of statusOf()) {
          if (status === 'verified' && claimTextIn(state.doc, id) !== claimTextIn(transaction.doc, id)) return false
        }
        return true
      },
      props: {
        decorations(state) {
          const statuses = statusOf()
          const decorations: Decoration[] = []
          state.doc.descendants((node, position) => {
            const mark = node.isText ? node.marks.find(m => m.type.name === 'claim') : undefined
            if (mark) decorations.push(Decoration.inline(position, position + node.nodeSize, { class: `claim-${statuses.get(mark.attrs.claimId) ?? 'open'}` }))
          })
          return DecorationSet.create(state.doc, decorations)
        },
      },
    })]
  },
})
