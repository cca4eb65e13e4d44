import type { ColumnReadings, DatasetDTO, PageDTO, RowDTO } from '#shared/types/dataset'

/** One dataset with its column profile; checks again every second while it imports. */
export function useDataset(id: Ref<string>) {
  const { data, error, refresh } = useFetch<DatasetDTO>(() => `/api/datasets/${id.value}`, { key: computed(() => `dataset-${id.value}`) })
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(data, (dataset) => {
    clearTimeout(timer)
    if (import.meta.client && dataset?.status === 'importing') timer = setTimeout(() => refresh(), 1000)
  }, { immediate: true })
  onBeforeUnmount(() => clearTimeout(timer))
  return { dataset: data, error }
}

/** A dataset's description when an id is chosen, nothing while none is; shared by key with useDataset. */
export function useChosenDataset(id: Ref<string | undefined>) {
  const requestFetch = useRequestFetch()
  const { data } = useAsyncData(
    () => `chosen-dataset-${id.value ?? 'none'}`,
    () => (id.value ? requestFetch<DatasetDTO>(`/api/datasets/${id.value}`) : Promise.resolve(null)),
    { watch: [id] },
  )
  return data
}

/** A page of a dataset's rows, sorted by one column when asked. */
export function useDatasetPreview(id: Ref<string>, enabled: Ref<boolean>) {
  // Page and order live in the address, so Back and reload return to the same rows.
  const route = useRoute()
  const router = useRouter()
  const fromQuery = (name: string) => (typeof route.query[name] === 'string' ? route.query[name] as string : undefined)
  const setQuery = (changes: Record<string, string | undefined>) => router.replace({ query: { ...route.query, ...changes } })
  const page = computed({
    get: () => Math.max(1, Number(fromQuery('page')) || 1),
    set: value => setQuery({ page: value > 1 ? String(value) : undefined }),
  })
  const sort = computed(() => fromQuery('sort'))
  const dir = computed<'asc' | 'desc'>(() => (fromQuery('dir') === 'desc' ? 'desc' : 'asc'))
  const requestFetch = useRequestFetch()
  const { data, status } = useAsyncData(
    () => `preview-${id.value}-${page.value}-${sort.value}-${dir.value}-${enabled.value}`,
    () => (enabled.value
      ? requestFetch<PageDTO<RowDTO>>(`/api/datasets/${id.value}/preview`, { query: { page: page.value, sort: sort.value, dir: dir.value } })
      : Promise.resolve(null)),
    { watch: [enabled, page, sort, dir] },
  )
  function sortBy(column: string) {
    const descending = sort.value === column && dir.value === 'asc'
    setQuery({ sort: column, dir: descending ? 'desc' : undefined, page: undefined })
  }
  return { rows: data, page, sort, dir, sortBy, loading: computed(() => status.value === 'pending') }
}

/**
 * What a member does with one dataset: archive or restore it, delete it, and read its stored bytes
 * again as a new dataset (with other column readings, or another sheet of its workbook). Those two
 * answer the new dataset's id, to open it.
 */
export function useDatasetActions(datasetId: string) {
  const { data: held } = useNuxtData<DatasetDTO>(`dataset-${datasetId}`)
  async function setArchived(archived: boolean) {
    await $fetch(`/api/datasets/${datasetId}/${archived ? 'archive' : 'restore'}`, { method: 'POST' })
    // The answer says only that it is done: archiving changes nothing else of the dataset, or of its
    // place in the list of its readings.
    if (held.value) held.value = { ...held.value, archived, readings: held.value.readings.map(r => (r.id === datasetId ? { ...r, archived } : r)) }
  }
  async function remove() {
    await $fetch(`/api/datasets/${datasetId}`, { method: 'DELETE' })
  }
  async function readAgain(columns: ColumnReadings) {
    return (await $fetch<{ id: string }>(`/api/datasets/${datasetId}/readings`, { method: 'POST', body: { columns } })).id
  }
  async function readSheet(sheet: string) {
    return (await $fetch<{ id: string }>(`/api/datasets/${datasetId}/sheets`, { method: 'POST', body: { sheet } })).id
  }
  return { setArchived, remove, readAgain, readSheet }
}
