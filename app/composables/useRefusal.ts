/**
 * Runs a document action and keeps its refusal (four eyes, a lock, a stale version) for the
 * component that offered the action, so that it shows beside the button pressed, not at the top
 * of the page.
 */
export function useRefusal() {
  const store = useDocumentStore()
  const refusal = ref('')
  async function run(action: () => Promise<boolean>) {
    refusal.value = ''
    store.lastRefusal = null
    if (await action()) return
    // Shown here instead of under its place in the document.
    const last = store.lastRefusal as { place: string, text: string } | null
    refusal.value = last?.text ?? store.message
    if (last) store.dismiss(last.place)
    store.message = ''
  }
  return { refusal: readonly(refusal), run }
}
