import type { PageDTO, RaggedRowDTO } from '#shared/types/dataset'

/** A page of the rows that had more or fewer cells than the header (or JSON records with keys past the columns); the page lives in the address. */
export function useRaggedRows(id: Ref<string>) {
  const { page, setQuery, pageText } = useAddressQuery()
  const requestFetch = useRequestFetch()
  const { data, error } = useAsyncData(
    () => `ragged-${id.value}-${page.value}`,
    () => requestFetch<PageDTO<RaggedRowDTO> & { width: number }>(`/api/datasets/${id.value}/ragged-rows`, { query: { page: page.value } }),
    { watch: [page] },
  )
  const goTo = (next: number) => setQuery({ page: pageText(next) })
  return { rows: data, error, page, goTo }
}
