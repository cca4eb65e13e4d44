import type { InvestigationDTO, InvestigationSummaryDTO } from '#shared/types/investigation'

/** The newsroom's investigations, newest edit first, and the action that starts one. */
export function useInvestigations(newsroomId: Ref<string>) {
  const { data, refresh, status } = useFetch<InvestigationSummaryDTO[]>('/api/investigations', {
    key: computed(() => `investigations-${newsroomId.value}`),
    query: { newsroomId },
    default: () => [],
  })
  async function create(title: string) {
    const created = await $fetch<InvestigationDTO>('/api/investigations', { method: 'POST', body: { newsroomId: newsroomId.value, title } })
    await refresh()
    return created
  }
  return { investigations: data, create, refresh, pending: computed(() => status.value === 'pending') }
}
