// A page on another site can point its own domain name at this server (DNS rebinding) and then
// read and write it as if same-origin: the browser sends that name as Host. Only the configured
// public address (NUXT_PUBLIC_URL), NUXT_ALLOWED_HOSTS and loopback names are answered.
// The whole Host, with at most a port: "localhost:3000@rebound.example" is no loopback name.
const LOOPBACK = /^(localhost|127\.0\.0\.1|\[::1\])(:\d{1,5})?$/

export default defineEventHandler((event) => {
  const host = (getRequestHeader(event, 'host') ?? '').toLowerCase()
  if (!allowedHosts().has(host) && !LOOPBACK.test(host)) {
    throw fail(421, { message: `Mantissa answers at its own address, not at ${host || 'an unnamed host'}.` })
  }
})

let allowed: Set<string> | undefined
function allowedHosts(): Set<string> {
  if (allowed) return allowed
  const config = useRuntimeConfig()
  const names = [config.publicUrl, ...String(config.allowedHosts).split(',')].map(text => text.trim()).filter(Boolean)
  allowed = new Set(names.map((name) => {
    try {
      return new URL(name.includes('://') ? name : `http://${name}`).host.toLowerCase()
    }
    catch {
      return name.toLowerCase()
    }
  }))
  return allowed
}
