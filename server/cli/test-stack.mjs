// The stack the server and browser tests talk to: the test PostgreSQL and the built app on it.
// `npm test` starts it once for every test; `npm run test:server` and `test:browser` start it
// through the tests' global setup, or use the one that already answers on the test port.
import { spawn } from 'node:child_process'
import { once } from 'node:events'
import { createWriteStream, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { ensurePostgres } from './postgres.mjs'
import { buildIfStale, migrate, root, step, waitForServer } from './prepare.mjs'

const port = Number(process.env.MANTISSA_TEST_PORT ?? 3101)
const SERVER_LOG = join(root, 'tests', '.artifacts', 'server.log')
/** The running test app's process id and log, for a later run that reuses it. */
const SERVER_FILE = join(root, '.data', 'test-app.json')

/** Where the tests find the stack; MANTISSA_TEST_URL points them at another app. */
export const testUrl = process.env.MANTISSA_TEST_URL ?? `http://localhost:${port}`

export function testDatabase() {
  return ensurePostgres({ name: 'test', port: Number(process.env.MANTISSA_TEST_PG_PORT ?? 54339), database: 'mantissa_test', throwaway: true })
}

/**
 * What the test files read from the environment, beside the URL. They look at the database as the
 * app's role does; the audit trail's tests also try it as the schema's owner.
 */
export function testEnv(database) {
  return {
    MANTISSA_TEST_URL: testUrl,
    NUXT_DATABASE_URL: database.appUrl,
    MANTISSA_TEST_OWNER_DATABASE_URL: database.url,
    NUXT_STORAGE_BASE: join(root, '.data', 'test-files'),
    // Lower than the 200 MB default so the over-the-limit test sends 20 MB, not 200.
    NUXT_UPLOAD_LIMIT_BYTES: String(20 * 1024 * 1024),
  }
}

/** Starts the built app for the tests on the test port, as the app's database role; resolves once it answers. */
export async function startTestApp(database) {
  const env = {
    ...process.env,
    ...testEnv(database),
    NODE_ENV: 'production',
    NUXT_SESSION_PASSWORD: 'test-only-session-password-of-more-than-32-chars',
    NUXT_MAIL_SINK_ENABLED: 'true',
    NUXT_MAIL_SINK_PORT: String(Number(process.env.MANTISSA_TEST_MAIL_PORT ?? 2625)),
    NUXT_DEMO_SEED: 'true',
    // Every count the column scan answers from memory is checked against SQL's (column-scan.ts).
    NUXT_COLUMN_SCAN_MODE: 'verify',
    NUXT_PUBLIC_URL: testUrl,
    PORT: String(port),
    NITRO_HOST: '127.0.0.1',
  }
  // The app never gets the owner's URL.
  delete env.MANTISSA_TEST_OWNER_DATABASE_URL
  step(`starting the built app for server and browser tests on ${testUrl}`)
  const server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] })
  // Its output also goes to a file, where the tests look for errors it only logged (an unhandled rejection).
  mkdirSync(dirname(SERVER_LOG), { recursive: true })
  const log = createWriteStream(SERVER_LOG)
  for (const [from, to] of [[server.stdout, process.stdout], [server.stderr, process.stderr]]) {
    from.on('data', (chunk) => {
      to.write(chunk)
      log.write(chunk)
    })
  }
  const exited = once(server, 'exit')
  await Promise.race([waitForServer(testUrl), exited.then(([code]) => {
    throw new Error(`the test app exited with code ${code} before it answered`)
  })])
  const processEnv = { MANTISSA_TEST_SERVER_PID: String(server.pid), MANTISSA_TEST_SERVER_LOG: SERVER_LOG }
  writeFileSync(SERVER_FILE, JSON.stringify(processEnv))
  return {
    /** What the tests need to watch the app's process (tests/support/server-process.ts). */
    env: processEnv,
    async stop() {
      if (server.exitCode !== null || server.signalCode !== null) return
      server.kill('SIGTERM')
      await exited
    },
  }
}

async function answers(url) {
  try {
    return (await fetch(`${url}/api/health`)).ok
  }
  catch {
    return false
  }
}

/**
 * The stack for a run of server or browser tests: the app already answering on the test port
 * (left as it is), else the test PostgreSQL (kept between runs, migrated), a build when the sources
 * changed, and the app, which `stop` ends. Sets the test files' environment either way.
 */
export async function useTestStack() {
  const database = testDatabase()
  for (const [name, value] of Object.entries(testEnv(database))) process.env[name] ??= value
  if (await answers(testUrl)) {
    step(`using the app that answers on ${testUrl}`)
    // The process the last start left, if it is the one still running.
    if (existsSync(SERVER_FILE)) {
      const known = JSON.parse(readFileSync(SERVER_FILE, 'utf8'))
      if (existsSync(`/proc/${known.MANTISSA_TEST_SERVER_PID}`)) for (const [name, value] of Object.entries(known)) process.env[name] ??= value
    }
    return { env: {}, stop: async () => {} }
  }
  migrate(database.url, database.appUrl)
  buildIfStale()
  const app = await startTestApp(database)
  Object.assign(process.env, app.env)
  return app
}
