// `npm start`: everything a new user needs, from a fresh machine to a running demo newsroom.
import { spawn } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { ensurePostgres } from './postgres.mjs'
import { buildIfStale, ensureDependencies, localSessionPassword, migrate, root, step, waitForServer } from './prepare.mjs'

const dev = process.argv.includes('--dev')
const port = Number(process.env.PORT ?? 3000)

ensureDependencies()
step('starting PostgreSQL')
const database = ensurePostgres({ name: 'dev', port: Number(process.env.MANTISSA_PG_PORT ?? 54329), database: 'mantissa' })
// Given a database of one's own, the app runs as NUXT_DATABASE_URL's role and migrates as the owner's.
const databaseUrl = process.env.NUXT_DATABASE_URL ?? database.appUrl
migrate(process.env.NUXT_DATABASE_OWNER_URL ?? (process.env.NUXT_DATABASE_URL ? databaseUrl : database.url), databaseUrl)
if (!dev) buildIfStale()

const env = {
  ...process.env,
  NUXT_DATABASE_URL: databaseUrl,
  NUXT_SESSION_PASSWORD: localSessionPassword(),
  NUXT_MAIL_SINK_ENABLED: process.env.NUXT_SMTP_URL ? 'false' : 'true',
  NUXT_DEMO_SEED: process.env.NUXT_DEMO_SEED ?? 'true',
  NUXT_PUBLIC_URL: process.env.NUXT_PUBLIC_URL ?? `http://localhost:${port}`,
  PORT: String(port),
  NITRO_HOST: process.env.NITRO_HOST ?? '127.0.0.1',
  MANTISSA_DEMO_LINK_FILE: join(root, '.data', 'demo-public-link'),
}
step(dev ? 'starting the development server' : 'starting Mantissa')
const server = dev
  ? spawn(join(root, 'node_modules', '.bin', 'nuxt'), ['dev', '--port', String(port)], { cwd: root, env, stdio: 'inherit' })
  : spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], { cwd: root, env, stdio: 'inherit' })

for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal))
server.on('exit', code => process.exit(code ?? 0))

const url = `http://localhost:${port}`
await waitForServer(url, dev ? 180 : 60)
const demo = JSON.parse(readFileSync(join(root, 'server', 'services', 'demo', 'people.json'), 'utf8'))
// The file keeps the address the link was made under; on a later start the port may differ, the path not.
const stored = existsSync(env.MANTISSA_DEMO_LINK_FILE) ? readFileSync(env.MANTISSA_DEMO_LINK_FILE, 'utf8').trim() : null
const published = stored ? new URL(new URL(stored).pathname, env.NUXT_PUBLIC_URL).href : null
console.log(`
  Mantissa is running at ${url}

  Demo sign-ins (password for all: ${demo.password})
${demo.people.map(p => `    ${p.role.padEnd(13)} ${p.email}`).join('\n')}

  ${published ? `The demo investigation's published page: ${published}\n  ` : ''}Mail sent by the app is caught locally: ${url}/dev/mail
  Stop with Ctrl+C.
`)
