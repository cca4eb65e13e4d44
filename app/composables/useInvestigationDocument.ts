import { storeToRefs } from 'pinia'
import type { InvestigationDTO } from '#shared/types/investigation'

/**
 * Loads an investigation into the document store and says what the member may do with it.
 * Await `ready` in the page: watchers do not run during server rendering, so without it the
 * server drew an empty page and the browser's first render did not match it.
 */
export function useInvestigationDocument(id: Ref<string>) {
  const store = useDocumentStore()
  const { me, ready: meReady } = useMe()
  const { user } = useUserSession()
  const fetched = useFetch<InvestigationDTO>(() => `/api/investigations/${id.value}`, { key: computed(() => `investigation-${id.value}`) })
  const { data, error } = fetched
  watch(data, (dto) => {
    if (dto) store.load(dto)
  }, { immediate: true })
  const { investigation } = storeToRefs(store)
  const role = computed(() => me.value?.memberships.find(m => m.newsroomId === investigation.value?.newsroomId)?.role)
  const showViewer = () => {
    store.viewer = role.value && user.value ? { role: role.value, userId: user.value.id } : null
  }
  watch([role, user], showViewer, { immediate: true })
  const ready = Promise.all([fetched, meReady]).then(() => {
    if (data.value && store.investigation?.id !== data.value.id) store.load(data.value)
    showViewer()
  })
  const canEdit = computed(() => Boolean(store.viewer && store.may('investigation.edit')))
  return { store, investigation, error, canEdit, role, ready }
}
