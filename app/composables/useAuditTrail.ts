import type { AuditEventDTO, AuditPageDTO, InvestigationDTO } from '#shared/types/investigation'

/**
 * An investigation's audit trail, newest first, a page at a time, narrowed to a family of actions
 * (`kind`: 'claim' is every claim.* event) and one person (`actor`), with the investigation it
 * belongs to and the address of the same events as CSV.
 */
export function useAuditTrail(id: Ref<string>) {
  const kind = ref('')
  const actor = ref('')
  const filters = computed(() => ({ ...(kind.value ? { kind: kind.value } : {}), ...(actor.value ? { actor: actor.value } : {}) }))
  const { data: first, error } = useFetch<AuditPageDTO>(() => `/api/investigations/${id.value}/audit`, {
    key: computed(() => `audit-${id.value}-${kind.value}-${actor.value}`), query: filters,
    default: () => ({ events: [], next: null }),
  })
  const investigation = useFetch<InvestigationDTO>(() => `/api/investigations/${id.value}`, { key: computed(() => `investigation-${id.value}`) })

  // Older pages, fetched on request and shown under the first.
  const older = ref<AuditEventDTO[]>([])
  const next = ref<string | null>(null)
  const loadingOlder = ref(false)
  watch(first, (page) => {
    older.value = []
    next.value = page.next
  }, { immediate: true })

  async function loadOlder() {
    if (!next.value) return
    loadingOlder.value = true
    try {
      const page = await $fetch<AuditPageDTO>(`/api/investigations/${id.value}/audit`, { query: { before: next.value, ...filters.value } })
      older.value.push(...page.events)
      next.value = page.next
    }
    finally {
      loadingOlder.value = false
    }
  }

  return {
    kind, actor, error, next, loadingOlder, loadOlder,
    events: computed(() => [...first.value.events, ...older.value]),
    download: computed(() => `/api/investigations/${id.value}/audit.csv${Object.keys(filters.value).length ? `?${new URLSearchParams(filters.value)}` : ''}`),
    investigation: investigation.data,
    /** Await it before what depends on the investigation, such as its newsroom's members. */
    loaded: investigation.then(() => undefined),
  }
}
