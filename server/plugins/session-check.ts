import { currentSession } from '../services/account/sessions'

// The browser asks /api/_auth/session (nuxt-auth-utils) whether it is signed in; a cookie whose
// session was ended server-side answers 401 there too, and the cookie is cleared.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (_session, event) => {
    if (await currentSession(event)) return
    await clearUserSession(event)
    throw fail(401)
  })
})
