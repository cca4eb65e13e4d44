import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

const root = fileURLToPath(new URL('..', import.meta.url))
const alias = { '#shared': `${root}shared` }

const globalSetup = ['tests/global-setup.ts']

// Four projects: unit (no server), server (HTTP against the built app and its PostgreSQL),
// components (Vue components in a Nuxt environment), browser (Debian's Chromium driven by playwright-core).
// Server and browser tests start the app and its PostgreSQL in their global setup, or use the running one.
export default defineConfig({
  test: {
    root,
    projects: [
      { resolve: { alias }, test: { name: 'unit', environment: 'node', include: ['tests/unit/**/*.test.ts'] } },
      { resolve: { alias }, test: { name: 'server', environment: 'node', include: ['tests/server/**/*.test.ts'], globalSetup, testTimeout: 30_000, hookTimeout: 60_000 } },
      await defineVitestProject({ test: { name: 'components', environment: 'nuxt', include: ['tests/components/**/*.test.ts'], environmentOptions: { nuxt: { rootDir: root, domEnvironment: 'happy-dom' } } } }),
      { resolve: { alias }, test: { name: 'browser', environment: 'node', include: ['tests/browser/**/*.test.ts'], globalSetup, testTimeout: 60_000, hookTimeout: 60_000, fileParallelism: false } },
    ],
  },
})
