import { z } from 'zod'

// zod compiles its object parsers with `new Function` where it may, and probes for that by trying
// it; the Content-Security-Policy forbids it, and Chromium reports even the caught probe as a
// violation. In the browser zod interprets its schemas instead (the forms' schemas are small).
export default defineNuxtPlugin(() => {
  z.config({ jitless: true })
})
