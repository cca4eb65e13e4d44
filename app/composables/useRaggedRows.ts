import type { PageDTO, RaggedRowDTO } from '#shared/types/dataset'

/** A page of the rows that had more or fewer cells than the header; the page lives in the address. */
export function useRaggedRows(id: Ref<string>) {
  const route = useRoute()
  const router = useRouter()
  const page = computed(() => Math.max(1, Number(route.query.page) || 1))
  const requestFetch = useRequestFetch()
  const { data, error } = useAsyncData(
    () => `ragged-${id.value}-${page.value}`,
    () => requestFetch<PageDTO<RaggedRowDTO> & { width: number }>(`/api/datasets/${id.value}/ragged-rows`, { query: { page: page.value } }),
    { watch: [page] },
  )
  const goTo = (next: number) => router.replace({ query: { ...route.query, page: next > 1 ? String(next) : undefined } })
  return { rows: data, error, page, goTo }
}
