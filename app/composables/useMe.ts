import type { MeDTO } from '#shared/types/dto'

/** The signed-in member and their newsrooms; one shared fetch under the key "me". */
export function useMe() {
  const { loggedIn } = useUserSession()
  const fetched = useFetch<MeDTO>('/api/me', {
    key: 'me',
    immediate: loggedIn.value,
    watch: [loggedIn],
  })
  const { data, refresh, status } = fetched
  return { me: readonly(data), refresh, status, ready: fetched.then(() => undefined) }
}
