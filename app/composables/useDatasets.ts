import type { DatasetSummaryDTO } from '#shared/types/dataset'

/** The newsroom's datasets (those `search` finds, when given); checks again every second while any of them is importing. */
export function useDatasets(newsroomId: Ref<string>, search: Ref<string> = ref('')) {
  // No `default`: during hydration useFetch takes any value it already holds as fetched, so a
  // form first drawn in the browser (an analysis block's) kept an empty default list and said the
  // newsroom had no dataset.
  const { data, refresh, status, error } = useFetch<DatasetSummaryDTO[]>('/api/datasets', {
    key: computed(() => `datasets-${newsroomId.value}-${search.value}`),
    query: { newsroomId, q: computed(() => search.value || undefined) },
  })
  const datasets = computed(() => data.value ?? [])
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(datasets, (list) => {
    clearTimeout(timer)
    if (import.meta.client && list.some(d => d.status === 'importing')) timer = setTimeout(() => refresh(), 1000)
  }, { immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))
  return { datasets, refresh, pending: computed(() => status.value === 'pending'), error }
}
