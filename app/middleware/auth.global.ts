// Every page needs a signed-in member unless it says `auth: false` in its page meta.
export default defineNuxtRouteMiddleware((to) => {
  if (to.meta.auth === false) return
  const { loggedIn } = useUserSession()
  if (!loggedIn.value) return navigateTo({ path: '/login', query: to.fullPath === '/' ? {} : { next: to.fullPath } })
})
