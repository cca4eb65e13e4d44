import { memoryStorage } from '~/utils/memory-storage'

// A browser that blocks a third-party frame's storage (Chromium with third-party cookies blocked, the
// default of a private window) throws on the first read of `window.localStorage`. A published chart's
// embed sits in another site's page, and nuxt-auth-utils' client plugin reads localStorage while the
// app starts (atinux/nuxt-auth-utils#519), so the whole app stopped there and the chart never drew.
// Before any other plugin runs, a refused storage is replaced by one that lasts as long as the page.
export default defineNuxtPlugin({
  name: 'storage-fallback',
  enforce: 'pre',
  setup() {
    for (const name of ['localStorage', 'sessionStorage'] as const) {
      try {
        void window[name].length
      }
      catch {
        Object.defineProperty(window, name, { value: memoryStorage(), configurable: true })
      }
    }
  },
})
