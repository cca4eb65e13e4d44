import { z } from 'zod'

// zod compiles object parsers with `new Function` when it may, and decides that (by trying it)
// as each object schema is built. The browser's Content-Security-Policy forbids it, and Chromium
// reports even the caught attempt as a violation, so the schemas, which the forms and routes
// share, are interpreted instead. Every schema module imports `z` from here, so this runs first.
z.config({ jitless: true })

export { z }
