import type { NewsroomDTO } from '#shared/types/dto'

/** The newsroom named by the route's `id`, with the member's role in it. */
export function useNewsroom() {
  const route = useRoute()
  const id = computed(() => route.params.id as string)
  const { data, error, refresh } = useFetch<NewsroomDTO>(() => `/api/newsrooms/${id.value}`, {
    key: computed(() => `newsroom-${id.value}`),
  })
  return { id, newsroom: readonly(data), error, refresh }
}
