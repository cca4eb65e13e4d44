import type { H3Event } from 'h3'

// Refuses a change that a page of another site makes a signed-in browser send (cross-site
// request forgery). SameSite=Lax keeps the session cookie off most such requests already; this
// also covers a neighbouring subdomain, which counts as the same site, and older browsers.
// Scripts (curl, the README's API) send none of the headers read here and pass.
const CHANGES = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

export default defineEventHandler((event) => {
  if (!CHANGES.has(event.method) || !event.path.startsWith('/api/')) return
  const source = foreignSource(event)
  if (source) {
    throw fail(403, { message: `Mantissa accepts changes only from its own pages, and this request came from ${source}.` })
  }
})

/** Where a request came from when that is not Mantissa itself, or null. */
function foreignSource(event: H3Event): string | null {
  // Behind a proxy the Host header may be the app server's own; the configured address is what
  // people open. Hosts are compared, not schemes: a TLS proxy talks plain http to the app.
  const own = new Set([getRequestHeader(event, 'host'), urlOf(useRuntimeConfig().publicUrl)?.host].filter(Boolean))
  const origin = getRequestHeader(event, 'origin')
  if (origin) {
    if (origin === 'null') return 'a page that hides its origin'
    return own.has(urlOf(origin)?.host) ? null : origin
  }
  const site = getRequestHeader(event, 'sec-fetch-site')
  if (site) return site === 'same-origin' || site === 'none' ? null : `another site (Sec-Fetch-Site: ${site})`
  const referer = urlOf(getRequestHeader(event, 'referer'))
  if (referer && !own.has(referer.host)) return referer.origin
  return null
}

function urlOf(text: string | undefined): URL | null {
  if (!text) return null
  try {
    return new URL(text)
  }
  catch {
    return null
  }
}
