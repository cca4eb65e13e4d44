// A PostgreSQL cluster and an app server of the fault tests' own, beside the ones `npm test` shares
// with every other test file, so that crashing them disturbs nobody else.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { once } from 'node:events'
import { existsSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { ensurePostgres } from '../../server/cli/postgres.mjs'
import { root, run, waitForServer } from '../../server/cli/prepare.mjs'
import { createNewsroomWithAdminInvitation } from '../../server/cli/newsroom'
import { Client } from './api'
import { PASSWORD } from './newsroom'

/** Its own ports, set by MANTISSA_FAULT_*, else a fixed step from the ports `npm test` was given. */
function portOf(own: string, shared: string, sharedDefault: number, step: number): number {
  return Number(process.env[own] ?? Number(process.env[shared] ?? sharedDefault) + step)
}

export const FAULT_PG_PORT = portOf('MANTISSA_FAULT_PG_PORT', 'MANTISSA_TEST_PG_PORT', 54339, 20)
export const FAULT_PORT = portOf('MANTISSA_FAULT_PORT', 'MANTISSA_TEST_PORT', 3101, 8)
export const FAULT_MAIL_PORT = portOf('MANTISSA_FAULT_MAIL_PORT', 'MANTISSA_TEST_MAIL_PORT', 2625, 1)

const STOP_WAIT_MS = 15_000
const LOG_LINES = 80

export interface FaultStack {
  url: string
  databaseUrl: string
  newsroomId: string
  /** The newsroom's admin, signed in against this stack's app. */
  admin: Client
  /** The app process now running (it changes on every restart). */
  app: ChildProcess
  /** Kills PostgreSQL's processes at once (`pg_ctl stop -m immediate`), as a crash would. */
  crashDatabase: () => void
  startDatabase: () => void
  /** Kills the app with SIGKILL: no shutdown hooks, no finishing of requests in flight. */
  killApp: () => Promise<void>
  startApp: () => Promise<void>
  /** The app's last lines of output, for a failing test's message. */
  appLog: () => string
  stop: () => Promise<void>
}

async function exitOf(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return
  const exited = once(child, 'exit')
  child.kill(signal)
  const timer = setTimeout(() => child.kill('SIGKILL'), STOP_WAIT_MS)
  await exited
  clearTimeout(timer)
}

/** Starts the fault tests' cluster (fresh database, migrated) and the built app on it, with one newsroom. */
export async function startFaultStack(): Promise<FaultStack> {
  const server = join(root, '.output', 'server', 'index.mjs')
  if (!existsSync(server)) throw new Error('The built app is missing: run `npm test`, which builds it before the tests.')
  // Its own cluster: a throwaway's settings (no fsync) still survive a crash of PostgreSQL's
  // processes, which is what these tests cause; only a crash of the machine would need fsync.
  const database = ensurePostgres({ name: 'fault', port: FAULT_PG_PORT, database: 'mantissa_fault', throwaway: true })
  database.recreate()
  if (run(join(root, 'node_modules', '.bin', 'tsx'), ['server/cli/migrate.ts'], { NUXT_DATABASE_OWNER_URL: database.url, NUXT_DATABASE_URL: database.appUrl }) !== 0) {
    throw new Error('migrating the fault tests\' database failed')
  }
  const url = `http://localhost:${FAULT_PORT}`
  const storage = join(root, '.data', 'fault-files')
  rmSync(storage, { recursive: true, force: true })
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    NUXT_DATABASE_URL: database.appUrl,
    NUXT_SESSION_PASSWORD: 'fault-test-session-password-of-more-than-32-chars',
    NUXT_MAIL_SINK_ENABLED: 'true',
    NUXT_MAIL_SINK_PORT: String(FAULT_MAIL_PORT),
    NUXT_DEMO_SEED: 'false',
    NUXT_PUBLIC_URL: url,
    NUXT_STORAGE_BASE: storage,
    // Set here, not inherited: `npm test` lowers the limit for the shared app below the queued upload's size.
    NUXT_UPLOAD_LIMIT_BYTES: String(64 * 1024 * 1024),
    PORT: String(FAULT_PORT),
    NITRO_HOST: '127.0.0.1',
  }
  let output: string[] = []
  const launch = async () => {
    const child = spawn(process.execPath, [server], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] })
    for (const stream of [child.stdout!, child.stderr!]) {
      stream.on('data', (chunk: Buffer) => {
        output = [...output, ...chunk.toString().split('\n').filter(Boolean)].slice(-LOG_LINES)
      })
    }
    child.on('exit', (code, signal) => {
      output = [...output, `[the app exited: ${signal ?? `code ${code}`}]`].slice(-LOG_LINES)
    })
    stack.app = child
    await waitForServer(url, 60)
  }

  const stack: FaultStack = {
    url,
    databaseUrl: database.appUrl,
    newsroomId: '',
    admin: new Client(url),
    app: undefined as unknown as ChildProcess,
    crashDatabase: () => database.crash(),
    startDatabase: () => database.start(),
    killApp: () => exitOf(stack.app, 'SIGKILL'),
    startApp: launch,
    appLog: () => output.join('\n'),
    async stop() {
      // The app first, so that it does not log the database going away.
      if (stack.app) await exitOf(stack.app, 'SIGTERM')
      database.stop()
    },
  }
  try {
    await launch()
    const { newsroomId, token } = await createNewsroomWithAdminInvitation(database.url, 'Fault desk', 'admin@fault.example')
    stack.newsroomId = newsroomId
    const joined = await stack.admin.post(`/api/join/${token}`, { name: 'Fault Admin', password: PASSWORD })
    if (joined.status !== 201) throw new Error(`join answered ${joined.status}: ${JSON.stringify(joined.body)}`)
  }
  catch (error) {
    await stack.stop()
    throw error
  }
  return stack
}
