import type { ConversationDTO } from '#shared/types/conversation'
import { readAnchor } from '#shared/conversation/anchor'

/**
 * Loads an investigation's conversations into the conversation store and follows the address's
 * '#' part: the subject it names is the target, whose conversation opens. Await `ready` in the
 * page: watchers do not run during server rendering, so without it the server drew every thread
 * as not yet started ("Write the first message") and the browser's first render did not match it.
 */
export function useConversation(id: Ref<string>) {
  const store = useConversationStore()
  const route = useRoute()
  const fetched = useFetch<ConversationDTO>(() => `/api/investigations/${id.value}/threads`, { key: computed(() => `threads-${id.value}`) })
  const { data } = fetched
  watch(data, (dto) => {
    if (dto) store.load(id.value, dto)
  }, { immediate: true })
  const ready = fetched.then(() => {
    if (data.value) store.load(id.value, data.value)
  })
  function follow(hash: string) {
    store.target = readAnchor(hash)
    if (store.target) store.show(store.target.type, store.target.id)
  }
  watch(() => route.hash, follow)
  // The server never sees the '#' part: the page is drawn without a target first, as the server drew it,
  // and the target is shown once the browser has taken the page over.
  onMounted(() => follow(route.hash))
  return { store, ready }
}
