import type { output } from 'zod'
import type { invitationAcceptSchema, loginSchema, passwordResetRequestSchema, passwordResetSchema } from '#shared/schemas/auth'
import type { InvitationPeekDTO } from '#shared/types/dto'

/**
 * Signing in and out. The server sets or ends the session cookie; the session held here then
 * follows it, and signing out lands on the sign-in page.
 */
export function useAuth() {
  const { fetch: refreshSession, clear } = useUserSession()

  /** Throws the API's refusal, whose data says when a second factor or a password reset is wanted. */
  async function signIn(body: output<typeof loginSchema>) {
    await $fetch('/api/auth/login', { method: 'POST', body })
    await refreshSession()
  }

  /** Ends this session, or with `everywhere` every session of the account, this one too. */
  async function signOut({ everywhere = false } = {}) {
    await $fetch(everywhere ? '/api/auth/logout-everywhere' : '/api/auth/logout', { method: 'POST' })
    await clear()
    await navigateTo('/login')
  }

  return { signIn, signOut }
}

/** Asks for a reset link by e-mail; answers the sentence to show, the same whether the address is known or not. */
export function usePasswordResetRequest() {
  async function request(body: output<typeof passwordResetRequestSchema>) {
    return (await $fetch<{ message: string }>('/api/auth/password-reset', { method: 'POST', body })).message
  }
  return { request }
}

/** A password-reset link: whose account it resets and until when, and choosing the new password. */
export function usePasswordReset(token: string) {
  const { data: reset, error } = useFetch<{ email: string, expiresAt: string }>(`/api/auth/password-reset/${token}`, { key: `reset-${token}` })
  async function choose(body: output<typeof passwordResetSchema>) {
    await $fetch(`/api/auth/password-reset/${token}`, { method: 'POST', body })
  }
  return { reset, error, choose }
}

/** An invitation link: the newsroom and role it offers, and accepting it. */
export function useInvitationLink(token: string) {
  const { fetch: refreshSession } = useUserSession()
  const { data: invitation, error } = useFetch<InvitationPeekDTO>(`/api/join/${token}`, { key: `join-${token}` })
  /** True when the new member is signed in; an account with two-factor sign-in signs in with its code instead. */
  async function accept(body: output<typeof invitationAcceptSchema>) {
    const { signedIn } = await $fetch<{ signedIn: boolean }>(`/api/join/${token}`, { method: 'POST', body })
    if (signedIn) await refreshSession()
    return signedIn
  }
  return { invitation, error, accept }
}
