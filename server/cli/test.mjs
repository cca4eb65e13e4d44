// `npm test`: every check, on a fresh machine, against a throwaway PostgreSQL of its own.
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { buildIfStale, ensureChromium, ensureDependencies, migrate, root, run, step } from './prepare.mjs'
import { startTestApp, testDatabase, testEnv } from './test-stack.mjs'

const bin = name => join(root, 'node_modules', '.bin', name)
const failures = []

ensureDependencies()
ensureChromium()
step('starting the test PostgreSQL (throwaway, its own port and folder)')
const database = testDatabase()
database.recreate()
migrate(database.url)

step('lint (eslint)')
if (run('npm', ['run', '--silent', 'lint']) !== 0) failures.push('lint')
step('typecheck (nuxt typecheck)')
if (run(bin('nuxt'), ['typecheck']) !== 0) failures.push('typecheck')

buildIfStale()

const env = testEnv(database.url)
rmSync(env.NUXT_STORAGE_BASE, { recursive: true, force: true })
let results = { numPassedTests: 0, numFailedTests: 0, numPendingTests: 0 }
let app = null
try {
  app = await startTestApp(database.url)
  step('unit, server and browser tests (vitest)')
  const artifacts = join(root, 'tests', '.artifacts')
  mkdirSync(artifacts, { recursive: true })
  const report = join(artifacts, 'vitest.json')
  rmSync(report, { force: true })
  const code = run(bin('vitest'), ['run', '--config', 'tests/vitest.config.ts', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], { ...env, ...app.env })
  if (existsSync(report)) results = JSON.parse(readFileSync(report, 'utf8'))
  if (code !== 0) failures.push('tests')
}
catch (error) {
  console.error(error)
  failures.push('server')
}
finally {
  await app?.stop()
}

console.log(failures.length ? `\n✗ failed: ${failures.join(', ')}` : '\n✓ lint, typecheck and every test passed')
console.log(`${results.numPassedTests} passed, ${results.numFailedTests + (failures.length && !results.numFailedTests ? 1 : 0)} failed, ${results.numPendingTests} skipped`)
process.exit(failures.length ? 1 : 0)
