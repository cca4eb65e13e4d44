import type { QueueItemDTO } from '#shared/types/investigation'

/** What waits for the signed-in member in a newsroom: methods to review and claims to check. */
export function useQueue(newsroomId: Ref<string>) {
  const { data } = useFetch<{ review: QueueItemDTO[], factCheck: QueueItemDTO[] }>(() => `/api/newsrooms/${newsroomId.value}/queue`, {
    key: computed(() => `queue-${newsroomId.value}`),
  })
  return { queue: data }
}
