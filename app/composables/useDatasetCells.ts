import type { CellStatusAsked, RangedTest } from '#shared/schemas/dataset'
import type { CellDTO, PageDTO } from '#shared/types/dataset'

export interface CellChoice {
  column: string
  status: CellStatusAsked
  /** The test whose range the listed values are outside (status "outside"). */
  test?: RangedTest
}

/**
 * A page of one column's cells of one status, chosen in the address (column, status, test, page),
 * so that Back and reload come back to the same list; `fallback` is shown while the address names none.
 */
export function useDatasetCells(id: Ref<string>, fallback: Ref<CellChoice | null>) {
  const { text, setQuery, page, pageText } = useAddressQuery()
  const choice = computed<CellChoice | null>(() => {
    const column = text('column') ?? fallback.value?.column
    const status = (text('status') as CellStatusAsked | undefined) ?? fallback.value?.status
    if (!column || !status) return null
    return { column, status, test: status === 'outside' ? (text('test') as RangedTest | undefined) ?? 'first-two-digits' : undefined }
  })
  const requestFetch = useRequestFetch()
  const { data, error, status } = useAsyncData(
    () => `cells-${id.value}-${JSON.stringify(choice.value)}-${page.value}`,
    () => (choice.value
      ? requestFetch<PageDTO<CellDTO> & { column: string }>(`/api/datasets/${id.value}/cells`, { query: { ...choice.value, page: page.value } })
      : Promise.resolve(null)),
    { watch: [choice, page] },
  )
  const show = ({ page: next, ...changes }: Partial<CellChoice> & { page?: number }) => setQuery({ ...changes, page: pageText(next ?? 1) })
  const downloadHref = computed(() => (choice.value
    ? `/api/datasets/${id.value}/cells?${new URLSearchParams({ column: choice.value.column, status: choice.value.status, ...(choice.value.test ? { test: choice.value.test } : {}), format: 'csv' })}`
    : null))
  return { choice, page, cells: data, error, loading: computed(() => status.value === 'pending'), show, downloadHref }
}
