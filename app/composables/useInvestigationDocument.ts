import { storeToRefs } from 'pinia'
import type { InvestigationDTO } from '#shared/types/investigation'

/** Loads an investigation into the document store and says what the member may do with it. */
export function useInvestigationDocument(id: Ref<string>) {
  const store = useDocumentStore()
  const { me } = useMe()
  const { user } = useUserSession()
  const { data, error } = useFetch<InvestigationDTO>(() => `/api/investigations/${id.value}`, { key: computed(() => `investigation-${id.value}`) })
  watch(data, (dto) => {
    if (dto) store.load(dto)
  }, { immediate: true })
  const { investigation } = storeToRefs(store)
  const role = computed(() => me.value?.memberships.find(m => m.newsroomId === investigation.value?.newsroomId)?.role)
  watch([role, user], () => {
    store.viewer = role.value && user.value ? { role: role.value, userId: user.value.id } : null
  }, { immediate: true })
  const canEdit = computed(() => Boolean(store.viewer && store.may('investigation.edit')))
  return { store, investigation, error, canEdit, role }
}
