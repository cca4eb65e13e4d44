import type { output } from 'zod'
import type { passwordChangeSchema } from '#shared/schemas/auth'
import type { MeDTO, SessionDTO, TwoFactorSetupDTO } from '#shared/types/dto'

const SESSIONS_KEY = 'my-sessions'

/** The signed-in person's open sessions, and ending one of them or all. */
export function useSessions() {
  const { data: sessions } = useFetch<SessionDTO[]>('/api/me/sessions', { key: SESSIONS_KEY, default: () => [] })
  const { signOut } = useAuth()
  async function end(sessionId: string) {
    await $fetch(`/api/me/sessions/${sessionId}`, { method: 'DELETE' })
    sessions.value = sessions.value.filter(s => s.id !== sessionId)
  }
  return { sessions, end, endAll: () => signOut({ everywhere: true }) }
}

/**
 * The signed-in person's own settings: password, e-mail preferences and two-factor sign-in. Each
 * change shows what the server answered in the account ("me") and the list of sessions held here.
 */
export function useAccount() {
  const { data: me } = useNuxtData<MeDTO>('me')
  const { data: sessions } = useNuxtData<SessionDTO[]>(SESSIONS_KEY)
  const setMe = (change: Partial<MeDTO>) => {
    if (me.value) me.value = { ...me.value, ...change }
  }
  const setTwoFactor = (change: Partial<MeDTO['twoFactor']>) => {
    if (me.value) setMe({ twoFactor: { ...me.value.twoFactor, ...change } })
  }
  // Changing the password or turning two-factor sign-in on ends every other session.
  const keepOnlyThisSession = (change: Partial<SessionDTO> = {}) => {
    if (sessions.value) sessions.value = sessions.value.filter(s => s.current).map(s => ({ ...s, ...change }))
  }

  /** Answers how many other sessions it ended. */
  async function changePassword(body: output<typeof passwordChangeSchema>) {
    const { otherSessionsEnded } = await $fetch<{ otherSessionsEnded: number }>('/api/me/password', { method: 'POST', body })
    keepOnlyThisSession()
    return otherSessionsEnded
  }

  async function setPreference(name: 'notifyByEmail' | 'emailMentions', on: boolean) {
    setMe(await $fetch<Pick<MeDTO, 'notifyByEmail' | 'emailMentions'>>('/api/me/preferences', { method: 'PATCH', body: { [name]: on } }))
  }

  /** The secret to add to an authenticator app; two-factor sign-in is on only once a code from it is confirmed. */
  function startTwoFactor() {
    return $fetch<TwoFactorSetupDTO>('/api/me/two-factor/setup', { method: 'POST' })
  }

  /** Answers the recovery codes, shown this once; this session then counts as signed in with both factors. */
  async function confirmTwoFactor(code: string) {
    const { recoveryCodes } = await $fetch<{ recoveryCodes: string[] }>('/api/me/two-factor/confirm', { method: 'POST', body: { code } })
    setTwoFactor({ enabled: true, thisSession: true, recoveryCodesLeft: recoveryCodes.length })
    keepOnlyThisSession({ secondFactor: true })
    return recoveryCodes
  }

  async function replaceRecoveryCodes(code: string) {
    const { recoveryCodes } = await $fetch<{ recoveryCodes: string[] }>('/api/me/two-factor/recovery-codes', { method: 'POST', body: { code } })
    setTwoFactor({ recoveryCodesLeft: recoveryCodes.length })
    return recoveryCodes
  }

  async function disableTwoFactor(password: string) {
    await $fetch('/api/me/two-factor/disable', { method: 'POST', body: { password } })
    setTwoFactor({ enabled: false, recoveryCodesLeft: 0 })
  }

  return { changePassword, setPreference, startTwoFactor, confirmTwoFactor, replaceRecoveryCodes, disableTwoFactor }
}
