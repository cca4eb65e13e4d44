import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

const root = fileURLToPath(new URL('..', import.meta.url))
const alias = { '#shared': `${root}shared` }

// Four projects: unit (no server), server (HTTP against the built app and its PostgreSQL),
// components (Vue components in a Nuxt environment), browser (Debian's Chromium driven by playwright-core). `npm test` starts the app first.
export default defineConfig({
  test: {
    root,
    projects: [
      { resolve: { alias }, test: { name: 'unit', environment: 'node', include: ['tests/unit/**/*.test.ts'] } },
      { resolve: { alias }, test: { name: 'server', environment: 'node', include: ['tests/server/**/*.test.ts'], testTimeout: 30_000, hookTimeout: 60_000 } },
      await defineVitestProject({ test: { name: 'components', environment: 'nuxt', include: ['tests/components/**/*.test.ts'], environmentOptions: { nuxt: { rootDir: root, domEnvironment: 'happy-dom' } } } }),
      { resolve: { alias }, test: { name: 'browser', environment: 'node', include: ['tests/browser/**/*.test.ts'], testTimeout: 60_000, hookTimeout: 60_000, fileParallelism: false } },
    ],
  },
})
