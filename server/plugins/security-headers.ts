import type { NuxtRenderHTMLContext } from 'nuxt/app'

declare module 'h3' {
  interface H3EventContext {
    cspNonce?: string
  }
}

// A plugin rather than server/middleware: the `request` hook runs before Nitro serves static
// files, so /_nuxt/ assets and the favicon get the headers too.
export default defineNitroPlugin((nitroApp) => {
  const https = useRuntimeConfig().publicUrl.startsWith('https:')

  nitroApp.hooks.hook('request', (event) => {
    event.context.cspNonce = createCspNonce()
    // Only a published chart's embed page may be framed by other sites.
    const embeddable = event.path.startsWith('/embed/')
    setResponseHeaders(event, securityHeaders(event.context.cspNonce, { dev: import.meta.dev, https, embeddable }))
  })

  // Nuxt's renderer names itself in x-powered-by; the stack is nobody's business but ours.
  nitroApp.hooks.hook('render:response', (response) => {
    if (response.headers) delete response.headers['x-powered-by']
  })

  // Nuxt writes its scripts (entry module, payload, config) into the head and after the app;
  // the rendered app itself (`html.body`, where written text lands) is left alone on purpose.
  nitroApp.hooks.hook('render:html', (html: NuxtRenderHTMLContext, { event }) => {
    const nonce = event.context.cspNonce
    if (!nonce) return
    for (const part of [html.head, html.bodyPrepend, html.bodyAppend]) {
      part.forEach((chunk, i) => {
        part[i] = chunk.replace(/<script(?![^>]*\snonce=)/g, `<script nonce="${nonce}"`)
      })
    }
  })
})
