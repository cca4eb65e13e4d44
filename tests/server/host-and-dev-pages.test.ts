import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import type { AddressInfo } from 'node:net'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { ClientAt } from '../support/client-at'

// Issue 22: any Host header was trusted (a DNS-rebinding shape passed the origin check), and
// responses named the stack in x-powered-by. Issue 18: the development mail page must never be
// reachable outside development: a production build without the flag answers 404.

const root = join(import.meta.dirname, '..', '..')

/** A port nothing listens on (the kernel's pick), so checkouts testing side by side never meet. */
async function freePort(): Promise<number> {
  const probe = createServer()
  await new Promise<void>(resolve => probe.listen(0, '127.0.0.1', resolve))
  const { port } = probe.address() as AddressInfo
  await new Promise(resolve => probe.close(resolve))
  return port
}

describe('the Host header', () => {
  it('refuses a request that names another site as its host (DNS rebinding), with and without a session', async () => {
    const rebinding = new ClientAt('127.0.0.1', `rebound.example:${new URL(new Client().base).port}`)
    const page = await rebinding.request('GET', '/login', undefined, { accept: 'text/html' })
    expect(page.status).toBe(421)
    const change = await rebinding.request('POST', '/api/auth/login', { email: 'a@b.example', password: 'x' }, { origin: `http://rebound.example:${new URL(new Client().base).port}` })
    expect(change.status).toBe(421)
    expect(change.body.data.message).toContain('rebound.example')
  })

  it('takes a loopback name only as the whole host, with at most a port after it', async () => {
    const port = new URL(new Client().base).port
    const status = async (host: string) => (await new ClientAt('127.0.0.1', host).request('GET', '/api/health')).status
    for (const host of [`localhost:${port}@rebound.example`, `localhost:${port}.rebound.example`, `localhost.rebound.example:${port}`, `127.0.0.1.rebound.example:${port}`, `localhost:x${port}`]) {
      expect(await status(host), host).toBe(421)
    }
    for (const host of [`localhost:${port}`, `LOCALHOST:${port}`, `127.0.0.1:${port}`, `[::1]:${port}`, 'localhost']) {
      expect(await status(host), host).toBe(200)
    }
  })

  it('answers the configured address and loopback names, without x-powered-by', async () => {
    const page = await new Client().request('GET', '/login', undefined, { accept: 'text/html' })
    expect(page.status).toBe(200)
    expect(page.headers.get('x-powered-by')).toBeNull()
    const api = await new Client().get('/api/health')
    expect(api.headers.get('x-powered-by')).toBeNull()
  })
})

describe('the development mail page in a production build without NUXT_MAIL_SINK_ENABLED', () => {
  let server: ChildProcess
  let base = ''

  beforeAll(async () => {
    const port = await freePort()
    base = `http://localhost:${port}`
    server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
      cwd: root,
      stdio: 'ignore',
      env: {
        PATH: process.env.PATH,
        NODE_ENV: 'production',
        NUXT_DATABASE_URL: process.env.NUXT_DATABASE_URL,
        NUXT_SESSION_PASSWORD: 'test-only-session-password-of-more-than-32-chars',
        NUXT_PUBLIC_URL: base,
        NUXT_STORAGE_BASE: join(root, '.data', 'test-files-production-probe'),
        NUXT_JOBS_SCHEMA: 'pgboss_production_probe',
        PORT: String(port),
        NITRO_HOST: '127.0.0.1',
      },
    })
    const until = Date.now() + 60_000
    while (Date.now() < until) {
      if (await fetch(`${base}/api/health`).then(r => r.ok, () => false)) return
      await new Promise(r => setTimeout(r, 250))
    }
    throw new Error(`the production probe server did not answer at ${base}`)
  })

  afterAll(() => {
    server?.kill('SIGTERM')
  })

  it('answers 404 for the page and for its data', async () => {
    const client = new Client(base)
    expect((await client.get('/api/dev/mail')).status).toBe(404)
    expect((await client.request('GET', '/dev/mail', undefined, { accept: 'text/html' })).status).toBe(404)
    // The same build with the flag (the shared test server) does show it, so the 404 is the flag's doing.
    expect((await new Client().get('/api/dev/mail')).status).toBe(200)
  })
})
