import type { ConversationDTO } from '#shared/types/conversation'
import { readAnchor } from '#shared/conversation/anchor'

/**
 * Loads an investigation's conversations into the conversation store and follows the address's
 * '#' part: the subject it names is the target, whose conversation opens.
 */
export function useConversation(id: Ref<string>) {
  const store = useConversationStore()
  const route = useRoute()
  const { data } = useFetch<ConversationDTO>(() => `/api/investigations/${id.value}/threads`, { key: computed(() => `threads-${id.value}`) })
  watch(data, (dto) => {
    if (dto) store.load(id.value, dto)
  }, { immediate: true })
  watch(() => route.hash, (hash) => {
    store.target = readAnchor(hash)
    if (store.target) store.show(store.target.type, store.target.id)
  }, { immediate: true })
  return store
}
