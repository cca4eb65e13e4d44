// The development mail page lists every message the local sink caught, join and reset links
// included: outside development and tests (NUXT_MAIL_SINK_ENABLED unset) neither the page nor its
// data exists.
export default defineEventHandler((event) => {
  if (useRuntimeConfig().mailSink.enabled) return
  if (event.path === '/dev' || event.path.startsWith('/dev/') || event.path.startsWith('/api/dev/')) throw fail(404)
})
