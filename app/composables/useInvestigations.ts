import type { InvestigationDTO, InvestigationSummaryDTO, AnalysisSettings } from '#shared/types/investigation'

/** Starts a draft in a newsroom, with a first analysis block when `firstAnalysis` is given. */
export async function createDraft(newsroomId: string, title: string, firstAnalysis?: AnalysisSettings) {
  const created = await $fetch<InvestigationDTO>('/api/investigations', { method: 'POST', body: { newsroomId, title } })
  if (firstAnalysis) await $fetch(`/api/investigations/${created.id}/blocks`, { method: 'POST', body: { kind: 'analysis', settings: firstAnalysis } })
  return created
}

/** The newsroom's investigations, newest edit first, and the action that starts one. */
export function useInvestigations(newsroomId: Ref<string>) {
  const { data } = useFetch<InvestigationSummaryDTO[]>('/api/investigations', {
    key: computed(() => `investigations-${newsroomId.value}`),
    query: { newsroomId },
    default: () => [],
  })
  async function create(title: string) {
    const created = await createDraft(newsroomId.value, title)
    // The newest edit comes first.
    data.value = [created, ...data.value]
    return created
  }
  return { investigations: data, create }
}
