// Two app servers behind a round-robin proxy, sharing one PostgreSQL (with a streaming replica for
// reads) and one S3 store: the shape the README gives for scaling out, made on this machine.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { once } from 'node:events'
import { createServer, request } from 'node:http'
import type { Server } from 'node:http'
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { ensurePostgres, ensureReplica } from '../../server/cli/postgres.mjs'
import { root, run, waitForServer } from '../../server/cli/prepare.mjs'
import { createNewsroomWithAdminInvitation } from '../../server/cli/newsroom'
import { Client } from './api'
import { startFakeS3 } from './fake-s3'
import type { FakeS3 } from './fake-s3'
import { PASSWORD } from './newsroom'

const testPort = Number(process.env.MANTISSA_TEST_PORT ?? 3101)
const testPgPort = Number(process.env.MANTISSA_TEST_PG_PORT ?? 54339)
const testMailPort = Number(process.env.MANTISSA_TEST_MAIL_PORT ?? 2625)

/** Its own ports, a fixed step from the ones `npm test` was given (the fault tests take +1, +8 and +20). */
export const SCALE_PORTS = {
  primary: testPgPort + 40, replica: testPgPort + 41,
  apps: [testPort + 20, testPort + 21], proxy: testPort + 23,
  mail: [testMailPort + 3, testMailPort + 4],
}

/** The name the proxy gives each app server in its `x-served-by` header. */
export const APP_NAMES = ['a', 'b'] as const
export type AppName = typeof APP_NAMES[number]

export interface ScaleStack {
  /** The proxy's address: what a browser or script would use. */
  url: string
  appUrl: (name: AppName) => string
  databaseUrl: string
  replica: { url: string, psql: (sql: string) => string }
  newsroomId: string
  /** The newsroom's admin, signed in through the proxy. */
  admin: Client
  /** Kills one app server with SIGKILL, as a crashed machine would. */
  kill: (name: AppName) => Promise<void>
  stop: () => Promise<void>
}

async function exitOf(child: ChildProcess, signal: NodeJS.Signals) {
  if (child.exitCode !== null || child.signalCode !== null) return
  const exited = once(child, 'exit')
  child.kill(signal)
  await exited
}

/**
 * A proxy that sends each request to the next live app server in turn, as a load balancer with
 * health checks does, and names the one that answered.
 */
function roundRobinProxy(targets: { name: AppName, port: number, alive: () => boolean }[]): Server {
  let next = 0
  return createServer((incoming, outgoing) => {
    const live = targets.filter(t => t.alive())
    const target = live[next++ % live.length]
    if (!target) {
      outgoing.writeHead(502).end()
      return
    }
    const forwarded = request({ host: '127.0.0.1', port: target.port, method: incoming.method, path: incoming.url, headers: incoming.headers }, (answer) => {
      outgoing.writeHead(answer.statusCode ?? 502, { ...answer.headers, 'x-served-by': target.name })
      answer.pipe(outgoing)
    })
    forwarded.on('error', () => outgoing.headersSent ? outgoing.destroy() : outgoing.writeHead(502).end())
    incoming.pipe(forwarded)
  })
}

export async function startScaleStack(): Promise<ScaleStack> {
  const server = join(root, '.output', 'server', 'index.mjs')
  if (!existsSync(server)) throw new Error('The built app is missing: run `npm test`, which builds it before the tests.')
  const primary = ensurePostgres({ name: 'scale', port: SCALE_PORTS.primary, database: 'mantissa_scale', throwaway: true, replication: true })
  primary.recreate()
  if (run(join(root, 'node_modules', '.bin', 'tsx'), ['server/cli/migrate.ts'], { NUXT_DATABASE_URL: primary.url }) !== 0) {
    throw new Error('migrating the scale-out tests\' database failed')
  }
  const replica = ensureReplica({ name: 'scale-replica', port: SCALE_PORTS.replica, primary, database: 'mantissa_scale' })
  let s3: FakeS3 | null = null
  const apps = new Map<AppName, ChildProcess>()
  let proxy: Server | null = null
  const stop = async () => {
    await Promise.all([...apps.values()].map(app => exitOf(app, 'SIGTERM')))
    if (proxy) await new Promise(resolve => proxy!.close(resolve))
    await s3?.stop()
    replica.stop()
    primary.stop()
  }
  try {
    s3 = await startFakeS3(`scale-${Date.now()}/`)
    const url = `http://localhost:${SCALE_PORTS.proxy}`
    for (const [i, name] of APP_NAMES.entries()) {
      const env = {
        ...process.env,
        ...s3.env,
        NODE_ENV: 'production',
        NUXT_DATABASE_URL: primary.url,
        NUXT_DATABASE_READ_URL: replica.url,
        // One secret for every server, so that a session made on one is good on the other.
        NUXT_SESSION_PASSWORD: 'scale-test-session-password-of-more-than-32-chars',
        NUXT_MAIL_SINK_ENABLED: 'true',
        NUXT_MAIL_SINK_PORT: String(SCALE_PORTS.mail[i]),
        NUXT_DEMO_SEED: 'false',
        NUXT_PUBLIC_URL: url,
        NUXT_UPLOAD_LIMIT_BYTES: String(64 * 1024 * 1024),
        // A killed server's import is taken over after 30 s here instead of 15 minutes.
        NUXT_JOBS_EXPIRE_SECONDS: '30',
        NUXT_JOBS_MAINTENANCE_SECONDS: '2',
        PORT: String(SCALE_PORTS.apps[i]),
        NITRO_HOST: '127.0.0.1',
      }
      const app = spawn(process.execPath, [server], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] })
      apps.set(name, app)
      await waitForServer(`http://localhost:${SCALE_PORTS.apps[i]}`, 60)
    }
    const alive = (name: AppName) => () => apps.get(name)!.exitCode === null && apps.get(name)!.signalCode === null
    proxy = roundRobinProxy(APP_NAMES.map((name, i) => ({ name, port: SCALE_PORTS.apps[i]!, alive: alive(name) })))
    proxy.listen(SCALE_PORTS.proxy, '127.0.0.1')
    await once(proxy, 'listening')

    const admin = new Client(url)
    const { newsroomId, token } = await createNewsroomWithAdminInvitation(primary.url, 'Scale desk', 'admin@scale.example')
    const joined = await admin.post(`/api/join/${token}`, { name: 'Scale Admin', password: PASSWORD })
    if (joined.status !== 201) throw new Error(`join answered ${joined.status}: ${JSON.stringify(joined.body)}`)
    return {
      url,
      appUrl: name => `http://localhost:${SCALE_PORTS.apps[APP_NAMES.indexOf(name)]}`,
      databaseUrl: primary.url,
      replica,
      newsroomId,
      admin,
      kill: name => exitOf(apps.get(name)!, 'SIGKILL'),
      stop,
    }
  }
  catch (error) {
    await stop()
    throw error
  }
}
