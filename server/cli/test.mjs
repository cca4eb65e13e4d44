// `npm test`: every check, on a fresh machine, against a throwaway PostgreSQL of its own.
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { ensurePostgres } from './postgres.mjs'
import { buildIfStale, ensureChromium, ensureDependencies, ensurePoppler, migrate, root, run, step, waitForServer } from './prepare.mjs'

const port = Number(process.env.MANTISSA_TEST_PORT ?? 3101)
const mailPort = Number(process.env.MANTISSA_TEST_MAIL_PORT ?? 2625)
const url = `http://localhost:${port}`
const bin = name => join(root, 'node_modules', '.bin', name)
const failures = []

ensureDependencies()
ensureChromium()
ensurePoppler()
step('starting the test PostgreSQL (throwaway, its own port and folder)')
const database = ensurePostgres({ name: 'test', port: Number(process.env.MANTISSA_TEST_PG_PORT ?? 54339), database: 'mantissa_test', throwaway: true })
database.recreate()
migrate(database.url)

step('lint (eslint)')
if (run(bin('eslint'), ['.']) !== 0) failures.push('lint')
step('typecheck (nuxt typecheck)')
if (run(bin('nuxt'), ['typecheck']) !== 0) failures.push('typecheck')

buildIfStale()

const env = {
  ...process.env,
  NODE_ENV: 'production',
  NUXT_DATABASE_URL: database.url,
  NUXT_SESSION_PASSWORD: 'test-only-session-password-of-more-than-32-chars',
  NUXT_MAIL_SINK_ENABLED: 'true',
  NUXT_MAIL_SINK_PORT: String(mailPort),
  NUXT_DEMO_SEED: 'true',
  NUXT_PUBLIC_URL: url,
  NUXT_STORAGE_BASE: join(root, '.data', 'test-files'),
  // Lower than the 200 MB default so the over-the-limit test sends 20 MB, not 200.
  NUXT_UPLOAD_LIMIT_BYTES: String(20 * 1024 * 1024),
  PORT: String(port),
  NITRO_HOST: '127.0.0.1',
}
rmSync(env.NUXT_STORAGE_BASE, { recursive: true, force: true })
step(`starting the built app for server and browser tests on ${url}`)
const server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], { cwd: root, env, stdio: ['ignore', 'inherit', 'inherit'] })
let results = { numPassedTests: 0, numFailedTests: 0, numPendingTests: 0 }
try {
  await waitForServer(url)
  step('unit, server and browser tests (vitest)')
  const artifacts = join(root, 'tests', '.artifacts')
  mkdirSync(artifacts, { recursive: true })
  const report = join(artifacts, 'vitest.json')
  rmSync(report, { force: true })
  const code = run(bin('vitest'), ['run', '--config', 'tests/vitest.config.ts', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], {
    MANTISSA_TEST_URL: url,
    NUXT_DATABASE_URL: database.url,
    NUXT_STORAGE_BASE: env.NUXT_STORAGE_BASE,
    NUXT_UPLOAD_LIMIT_BYTES: env.NUXT_UPLOAD_LIMIT_BYTES,
  })
  if (existsSync(report)) results = JSON.parse(readFileSync(report, 'utf8'))
  if (code !== 0) failures.push('tests')
}
catch (error) {
  console.error(error)
  failures.push('server')
}
finally {
  server.kill('SIGTERM')
}

console.log(failures.length ? `\n✗ failed: ${failures.join(', ')}` : '\n✓ lint, typecheck and every test passed')
console.log(`${results.numPassedTests} passed, ${results.numFailedTests + (failures.length && !results.numFailedTests ? 1 : 0)} failed, ${results.numPendingTests} skipped`)
process.exit(failures.length ? 1 : 0)
