import { randomFillSync } from 'node:crypto'

const NONCE_BYTES = 16
// Random bytes are drawn for 256 nonces at once: one draw costs about as much as a small API
// answer's whole handling, and every response (JSON too) carries a nonce. Each slice is used once.
const pool = Buffer.alloc(NONCE_BYTES * 256)
let used = pool.length

/** A fresh nonce for the inline scripts of one response (128 random bits). */
export function createCspNonce(): string {
  if (used === pool.length) {
    randomFillSync(pool)
    used = 0
  }
  used += NONCE_BYTES
  return pool.toString('base64', used - NONCE_BYTES, used)
}

/**
 * The Content-Security-Policy of every response. Scripts run only from this origin or with the
 * response's nonce, which the renderer adds to the scripts Nuxt writes into the page
 * (`server/plugins/security-headers.ts`). To allow a new source, add it to the one directive
 * that needs it here, never to `default-src`.
 */
export function contentSecurityPolicy(nonce: string, { dev = false, embeddable = false } = {}): string {
  const directives: Record<string, string[]> = {
    'default-src': ['\'self\''],
    // Development only: Nuxt's error overlay is appended to an error page after rendering, so its
    // inline scripts miss the nonce; they need 'unsafe-inline', which a nonce would switch off.
    // Hot module updates need nothing more. Nothing ever needs 'unsafe-eval'.
    'script-src': ['\'self\'', dev ? '\'unsafe-inline\'' : `'nonce-${nonce}'`],
    // Vue renders bound styles as `style="…"` attributes and vega-embed and Tiptap add <style>
    // elements at run time; none of them can carry a nonce (and a nonce here would switch
    // 'unsafe-inline' off). Styles cannot run code, so this is the usual trade.
    'style-src': ['\'self\'', '\'unsafe-inline\''],
    // The chart images Vega makes (PNG and SVG) are data: and blob: addresses; showing one in a
    // page must not need a change here.
    'img-src': ['\'self\'', 'data:', 'blob:'],
    // Merriweather and Inter ship with the app (@fontsource).
    'font-src': ['\'self\''],
    // 'self' covers the development server's hot-reload socket too (same host and port).
    'connect-src': ['\'self\''],
    'object-src': ['\'none\''],
    'base-uri': ['\'none\''],
    'form-action': ['\'self\''],
    // A published chart's embed page (/embed/…) is made to sit in a story on another site.
    'frame-ancestors': [embeddable ? '*' : '\'none\''],
    // Development only: when the server restarts, Vite's client waits for it in a worker made
    // from a blob: address; Nuxt's error overlay shows the error page in a data: frame.
    ...(dev ? { 'worker-src': ['\'self\'', 'blob:'], 'frame-src': ['\'self\'', 'data:'] } : {}),
  }
  return Object.entries(directives).map(([name, sources]) => `${name} ${sources.join(' ')}`).join('; ')
}

/**
 * Every header Mantissa sends with every response, pages, API replies and static files alike.
 * `https`: the configured public address is https, so browsers may be told to stay on it.
 */
export function securityHeaders(nonce: string, { dev = false, https = false, embeddable = false } = {}): Record<string, string> {
  return {
    'Content-Security-Policy': contentSecurityPolicy(nonce, { dev, embeddable }),
    // For browsers that predate frame-ancestors; it has no value meaning "any site", so an embed page goes without.
    ...(embeddable ? {} : { 'X-Frame-Options': 'DENY' }),
    'X-Content-Type-Options': 'nosniff',
    // A public link's address holds its token: no other site may see it in Referer. Same-origin
    // requests keep their referrer (and their Origin header, which the origin check reads).
    'Referrer-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=(), usb=()',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Resource-Policy': 'same-origin',
    ...(https ? { 'Strict-Transport-Security': 'max-age=31536000' } : {}),
  }
}
