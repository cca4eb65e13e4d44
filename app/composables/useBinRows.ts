import type { PageDTO, RowDTO } from '#shared/types/dataset'

/**
 * The rows behind one bin of a dataset's digit test (`query`: the test, its column and bin key, and
 * the block's filters, sign, limit and group): the first `loaded` of them at once, and all of them
 * (up to `limit`) a page at a time for a download.
 */
export function useBinRows(datasetId: Ref<string>, query: Ref<Record<string, string | number | undefined>>, loaded: number) {
  const { data, error } = useFetch<PageDTO<RowDTO>>(() => `/api/datasets/${datasetId.value}/rows`, {
    key: computed(() => `bin-rows-${JSON.stringify(query.value)}`),
    query: computed(() => ({ ...query.value, pageSize: loaded })),
  })

  async function fetchAll(limit: number, pageSize: number) {
    const items: RowDTO[] = []
    for (let page = 1; items.length < limit; page++) {
      const next = await $fetch<PageDTO<RowDTO>>(`/api/datasets/${datasetId.value}/rows`, { query: { ...query.value, page, pageSize } })
      items.push(...next.items)
      if (items.length >= next.total || !next.items.length) break
    }
    return items
  }

  return { rows: data, error, fetchAll }
}
