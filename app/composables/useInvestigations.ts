import type { InvestigationDTO, InvestigationSummaryDTO, AnalysisSettings } from '#shared/types/investigation'

/**
 * Starts a draft in a newsroom, with a first analysis block when `firstAnalysis` is given: one
 * request, so a refused block leaves no empty draft behind.
 */
export function createDraft(newsroomId: string, title: string, firstAnalysis?: AnalysisSettings) {
  return $fetch<InvestigationDTO>('/api/investigations', { method: 'POST', body: { newsroomId, title, firstAnalysis } })
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
