import type { MeDTO, NewsroomDTO } from '#shared/types/dto'

/** The newsroom named by the route's `id`, with the member's role in it. */
export function useNewsroom() {
  const route = useRoute()
  const id = computed(() => route.params.id as string)
  const { data, error } = useFetch<NewsroomDTO>(() => `/api/newsrooms/${id.value}`, {
    key: computed(() => `newsroom-${id.value}`),
  })
  return { id, newsroom: readonly(data), error }
}

/**
 * Changes a newsroom's settings (four eyes, two-factor sign-in): the newsroom the server answers is
 * shown wherever it is held, and so is the setting in the member's own list of newsrooms.
 */
export function useNewsroomSettings(newsroomId: string) {
  const { data: held } = useNuxtData<NewsroomDTO>(`newsroom-${newsroomId}`)
  const { data: me } = useNuxtData<MeDTO>('me')
  async function change(settings: { fourEyes?: boolean, requireTwoFactor?: boolean }) {
    const newsroom = await $fetch<NewsroomDTO>(`/api/newsrooms/${newsroomId}`, { method: 'PATCH', body: settings })
    held.value = newsroom
    if (me.value) {
      me.value = { ...me.value, memberships: me.value.memberships.map(m => (m.newsroomId === newsroomId ? { ...m, requireTwoFactor: newsroom.requireTwoFactor } : m)) }
    }
  }
  return { change }
}
