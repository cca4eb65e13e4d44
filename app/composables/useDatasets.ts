import type { DatasetSummaryDTO } from '#shared/types/dataset'

/** The newsroom's datasets; checks again every second while any of them is importing. */
export function useDatasets(newsroomId: Ref<string>) {
  const { data, refresh, status, error } = useFetch<DatasetSummaryDTO[]>('/api/datasets', {
    key: computed(() => `datasets-${newsroomId.value}`),
    query: { newsroomId },
    default: () => [],
  })
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(data, (list) => {
    clearTimeout(timer)
    if (import.meta.client && list.some(d => d.status === 'importing')) timer = setTimeout(() => refresh(), 1000)
  }, { immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))
  return { datasets: data, refresh, pending: computed(() => status.value === 'pending'), error }
}
