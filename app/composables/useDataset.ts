import type { DatasetDTO, PageDTO, RowDTO } from '#shared/types/dataset'

/** One dataset with its column profile; checks again every second while it imports. */
export function useDataset(id: Ref<string>) {
  const { data, error, refresh } = useFetch<DatasetDTO>(() => `/api/datasets/${id.value}`, { key: computed(() => `dataset-${id.value}`) })
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(data, (dataset) => {
    clearTimeout(timer)
    if (import.meta.client && dataset?.status === 'importing') timer = setTimeout(() => refresh(), 1000)
  }, { immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))
  return { dataset: data, error, refresh }
}

/** A page of a dataset's rows, sorted by one column when asked. */
export function useDatasetPreview(id: Ref<string>, enabled: Ref<boolean>) {
  const page = ref(1)
  const sort = ref<string | undefined>()
  const dir = ref<'asc' | 'desc'>('asc')
  const { data, status } = useFetch<PageDTO<RowDTO>>(() => `/api/datasets/${id.value}/preview`, {
    key: computed(() => `preview-${id.value}-${page.value}-${sort.value}-${dir.value}`),
    query: { page, sort, dir },
    immediate: enabled.value,
    watch: [enabled],
  })
  function sortBy(column: string) {
    if (sort.value === column) dir.value = dir.value === 'asc' ? 'desc' : 'asc'
    else {
      sort.value = column
      dir.value = 'asc'
    }
    page.value = 1
  }
  return { rows: data, page, sort: readonly(sort), dir: readonly(dir), sortBy, loading: computed(() => status.value === 'pending') }
}
