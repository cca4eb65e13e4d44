// The local mail sink's inbox. It exists only where the sink runs (development, tests, demo).
export default defineEventHandler(() => {
  if (!useRuntimeConfig().mailSink.enabled) throw fail(404)
  return capturedMail()
})
