import type { NotificationDTO, NotificationPageDTO } from '#shared/types/conversation'

const COUNT_KEY = 'notifications-unread'

/** How many notifications the signed-in member has not read: the header's count, read again on every page change and each minute. */
export function useUnreadCount() {
  const { loggedIn } = useUserSession()
  const route = useRoute()
  const { data, refresh } = useFetch<NotificationPageDTO>('/api/me/notifications', {
    key: COUNT_KEY,
    query: { limit: 0 },
    immediate: loggedIn.value,
    watch: [loggedIn],
  })
  watch(() => route.path, () => {
    if (loggedIn.value) void refresh()
  })
  let timer: ReturnType<typeof setInterval> | undefined
  onMounted(() => {
    timer = setInterval(() => {
      if (loggedIn.value && document.visibilityState === 'visible') void refresh()
    }, 60_000)
  })
  onBeforeUnmount(() => clearInterval(timer))
  return { unread: computed(() => (loggedIn.value ? data.value?.unread ?? 0 : 0)) }
}

/** The signed-in member's notifications, a page at a time, with marking them read. */
export function useNotifications() {
  const { data, refresh, status } = useFetch<NotificationPageDTO>('/api/me/notifications', { key: 'notifications', query: { limit: 30 } })
  const more = ref<NotificationDTO[]>([])
  const next = ref<string | null>(null)
  watch(data, (page) => {
    more.value = []
    next.value = page?.next ?? null
  }, { immediate: true })
  const items = computed(() => [...(data.value?.items ?? []), ...more.value])

  async function loadMore() {
    if (!next.value) return
    const page = await $fetch<NotificationPageDTO>('/api/me/notifications', { query: { limit: 30, before: next.value } })
    more.value = [...more.value, ...page.items]
    next.value = page.next
  }

  const { data: count } = useNuxtData<NotificationPageDTO>(COUNT_KEY)
  async function markRead(body: { ids: string[] } | { all: true }) {
    await $fetch('/api/me/notifications/read', { method: 'POST', body })
    const ids = 'ids' in body ? new Set(body.ids) : null
    const marked = items.value.filter(item => !item.read && (!ids || ids.has(item.id)))
    for (const item of marked) item.read = true
    // The header's count follows: every one read, or those just marked that were unread.
    if (count.value) count.value = { ...count.value, unread: ids ? Math.max(0, count.value.unread - marked.length) : 0 }
  }

  return { items, next, status, unread: computed(() => items.value.filter(i => !i.read).length), refresh, loadMore, markRead }
}
