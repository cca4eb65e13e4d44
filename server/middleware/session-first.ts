// Routes a visitor without an account may call: signing in, joining, the public page, health, and
// nuxt-auth-utils' own session route (the page asks it who is signed in, and signing out clears the
// cookie through it; server/plugins/session-check.ts checks its answer against the sessions table).
const OPEN = [/^\/api\/auth\//, /^\/api\/_auth\//, /^\/api\/join\//, /^\/api\/public\//, /^\/api\/health$/, /^\/api\/dev\//]

// Every other API route needs a session, and it is asked for before the route looks anything up:
// without one, an id that exists and one that does not both answer 401, so nothing about the
// records leaks to a visitor who is not signed in.
export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/') || OPEN.some(open => open.test(path))) return
  await requireSignedIn(event)
})
