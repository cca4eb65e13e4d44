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
    if (await action()) return
    refusal.value = store.message
    store.message = ''
  }
  return { refusal: readonly(refusal), run }
}
