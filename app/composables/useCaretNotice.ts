import type { EditorView } from '@tiptap/pm/view'

export interface CaretNotice {
  text: string
  top: number
  left: number
}

const SHOWN_FOR_MS = 8000
const WIDTH = 288

/**
 * A short notice drawn just below the caret of an editor inside `container` (which must be
 * positioned): what a refused edit needs to say, said where the person is looking.
 */
export function useCaretNotice(container: Ref<HTMLElement | null>) {
  const notice = ref<CaretNotice | null>(null)
  let timer: ReturnType<typeof setTimeout> | undefined

  function hide() {
    clearTimeout(timer)
    notice.value = null
  }

  function show(view: EditorView, text: string) {
    if (!container.value) return
    const caret = view.coordsAtPos(view.state.selection.from)
    const box = container.value.getBoundingClientRect()
    notice.value = { text, top: caret.bottom - box.top + 4, left: Math.max(0, Math.min(caret.left - box.left, box.width - WIDTH)) }
    clearTimeout(timer)
    timer = setTimeout(hide, SHOWN_FOR_MS)
  }

  onBeforeUnmount(() => clearTimeout(timer))
  return { notice, show, hide }
}
