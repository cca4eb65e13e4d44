import { fileURLToPath } from 'node:url'
import { threadScripts } from './server/build/thread-scripts'

export default defineNuxtConfig({
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', '@nuxt/eslint'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Mantissa',
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/mark.svg' }],
    },
  },
  css: ['~/assets/css/main.css'],
  runtimeConfig: {
    // Every value here is overridden by NUXT_* environment variables (README: production settings).
    databaseUrl: '',
    // A read-only streaming replica for the digit counts and rows of ready datasets (README: scaling out).
    databaseReadUrl: '',
    smtpUrl: '',
    mailFrom: 'Mantissa <desk@mantissa.invalid>',
    mailSink: { enabled: false, port: 2525 },
    publicUrl: 'http://localhost:3000',
    // More host names the app answers to besides publicUrl's and loopback (a proxy that rewrites Host), comma-separated.
    allowedHosts: '',
    // Public link tokens are HMAC(secret, link id); unset, the session password serves (README).
    shareLinkSecret: '',
    demoSeed: false,
    uploadLimitBytes: 200 * 1024 * 1024,
    // driver "fs" keeps files under base; "s3" keeps them in the bucket and stages uploads under base.
    storage: {
      driver: 'fs', base: '.data/files',
      bucket: '', region: '', endpoint: '', forcePathStyle: false, accessKeyId: '', secretAccessKey: '', prefix: '',
    },
    // expireSeconds: how long a server may go silent on an import before another takes it over;
    // maintenanceSeconds: how often the queue looks for such imports (pg-boss's own default).
    jobs: { schema: 'pgboss', expireSeconds: 15 * 60, maintenanceSeconds: 120 },
    // Number columns read into memory for questions the import's counts do not hold (column-scan.ts):
    // mode "on", "off" or "verify" (tests: every answer from memory is checked against SQL's); budgetMb: at most this much kept.
    columnScan: { mode: 'on', budgetMb: 512 },
    session: {
      maxAge: 60 * 60 * 12,
      // Secure everywhere, not only in production: browsers keep Secure cookies on http://localhost,
      // so development and the tests sign in, and a deployment without HTTPS fails at sign-in
      // instead of sending the session in clear.
      cookie: { sameSite: 'lax', httpOnly: true, secure: true },
    },
  },
  // Static files live with the app, keeping the repository's top level to its fixed folders.
  dir: { public: 'app/public' },
  compatibilityDate: '2026-11-01',
  nitro: {
    // Tests and benchmarks that reach server code or Node's built-ins are checked with the server's types.
    typescript: {
      tsConfig: {
        compilerOptions: { noUnusedLocals: true },
        include: ['../tests/unit/**/*', '../tests/server/**/*', '../tests/support/**/*', '../tests/fixtures/**/*.ts', '../bench/**/*'],
        exclude: ['../tests/support/browser.ts'],
      },
    },
    rollupConfig: { plugins: [threadScripts(fileURLToPath(new URL('./shared', import.meta.url)))] },
    // The engine's exact decimal arithmetic uses BigInt literals.
    esbuild: { options: { target: 'es2022' } },
    externals: {
      // Node 20.19+ resolves these through their "module-sync" entry, which the file tracer misses.
      traceInclude: ['async-function', 'generator-function', 'async-generator-function']
        .flatMap(name => ['require.mjs', 'index.mjs', 'legacy.js'].map(file => `node_modules/${name}/${file}`)),
    },
  },
  vite: {
    build: {
      target: 'es2022',
      rollupOptions: {
        // The page imports the engine's index for its light parts (test names, ranges, the number
        // reader); stdlib's CommonJS modules behind the tails would otherwise stay in the bundle for
        // their "side effects", and one of them probes for generators with eval, which the CSP refuses.
        // They have none: dropping them where nothing calls them changes nothing that runs.
        treeshake: { moduleSideEffects: id => !id.includes('/node_modules/@stdlib/') },
      },
    },
    esbuild: { target: 'es2022' },
    optimizeDeps: {
      include: ['@tiptap/vue-3', '@tiptap/starter-kit', '@tiptap/pm/state', '@tiptap/pm/view', 'vega-embed', 'vega-lite', 'vega', 'vega-interpreter', 'arquero', 'papaparse', 'zod'],
    },
  },
  // `nuxt typecheck` covers the tests too, and a local nobody reads is an error everywhere.
  typescript: {
    strict: true,
    tsConfig: {
      compilerOptions: { noUnusedLocals: true },
      include: ['../tests/components/**/*'],
    },
    sharedTsConfig: { compilerOptions: { noUnusedLocals: true } },
    // Browser tests run in Node but hand functions to the page, so they see both Node's and the DOM's
    // types; their helpers reach server code (the newsroom script), so the server's auto-imports too.
    nodeTsConfig: {
      compilerOptions: {
        noUnusedLocals: true, lib: ['ESNext', 'DOM', 'DOM.Iterable'], types: ['node'],
        paths: { '#shared': ['../shared'], '#shared/*': ['../shared/*'], '#server': ['../server'], '#server/*': ['../server/*'] },
      },
      include: ['../tests/vitest.config.ts', '../tests/browser/**/*', '../tests/support/browser.ts', './types/nitro.d.ts', '../shared/**/*.d.ts'],
    },
  },
  telemetry: false,
  eslint: {
    config: { stylistic: true },
  },
  tailwindcss: { cssPath: false },
})
