import { randomBytes } from 'node:crypto'

/** A fresh nonce for the inline scripts of one response (128 random bits). */
export function createCspNonce(): string {
  return randomBytes(16).toString('base64')
}

/**
 * The Content-Security-Policy of every response. Scripts run only from this origin or with the
 * response's nonce, which the renderer adds to the scripts Nuxt writes into the page
 * (`server/plugins/security-headers.ts`). To allow a new source, add it to the one directive
 * that needs it here, never to `default-src`.
 */
export function contentSecurityPolicy(nonce: string, { dev = false } = {}): string {
  const directives: Record<string, string[]> = {
    'default-src': ['\'self\''],
    // Vite's development client injects and replaces modules with eval-based source maps; the
    // built app never evaluates strings (charts draw through vega-interpreter).
    'script-src': ['\'self\'', `'nonce-${nonce}'`, ...(dev ? ['\'unsafe-eval\''] : [])],
    // Vue renders bound styles as `style="…"` attributes and vega-embed and Tiptap add <style>
    // elements at run time; none of them can carry a nonce (and a nonce here would switch
    // 'unsafe-inline' off). Styles cannot run code, so this is the usual trade.
    'style-src': ['\'self\'', '\'unsafe-inline\''],
    // Vega hands its chart images (the PNG and SVG downloads) over as data: and blob: addresses.
    'img-src': ['\'self\'', 'data:', 'blob:'],
    'font-src': ['\'self\'', 'data:'],
    // Vite's hot-reload socket; in the built app 'self' is all the page talks to.
    'connect-src': ['\'self\'', ...(dev ? ['ws:', 'wss:'] : [])],
    'object-src': ['\'none\''],
    'base-uri': ['\'none\''],
    'form-action': ['\'self\''],
    'frame-ancestors': ['\'none\''],
  }
  return Object.entries(directives).map(([name, sources]) => `${name} ${sources.join(' ')}`).join('; ')
}

/**
 * Every header Mantissa sends with every response, pages, API replies and static files alike.
 * `https`: the configured public address is https, so browsers may be told to stay on it.
 */
export function securityHeaders(nonce: string, { dev = false, https = false } = {}): Record<string, string> {
  return {
    'Content-Security-Policy': contentSecurityPolicy(nonce, { dev }),
    // For browsers that predate frame-ancestors.
    'X-Frame-Options': 'DENY',
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
