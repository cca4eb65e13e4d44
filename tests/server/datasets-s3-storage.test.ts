import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { randomBytes, randomUUID } from 'node:crypto'
import { existsSync } from 'node:fs'
import { mkdtemp, readdir, rm, stat } from 'node:fs/promises'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { buffer } from 'node:stream/consumers'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { waitForServer } from '../../server/cli/prepare.mjs'
import { s3Driver } from '../../server/utils/file-drivers/s3'
import { signedIn } from '../support/api'
import type { Client } from '../support/api'
import { utf8, writeLargeCsv } from '../support/dataset-files'
import { sha256Of, sha256OfFile, storedFileExists, upload, waitUntilSettled } from '../support/datasets'
import { startFakeS3 } from '../support/fake-s3'
import type { FakeS3 } from '../support/fake-s3'
import { PASSWORD, createTestNewsroom } from '../support/newsroom'

// A second app server, built by `npm test` like the first, keeps its files in a fake S3 bucket
// (s3rver) and shares the test database. Its own job queue schema keeps the two servers from
// importing each other's uploads, which live in different stores.
const root = fileURLToPath(new URL('../..', import.meta.url))
const PREFIX = 'app-test/'
// upload.ts imports files up to 8 MB while the request waits; larger ones go to the job queue.
const QUEUED_BYTES = 9 * 1024 * 1024
const JOB_TIMEOUT_MS = 90_000

async function freePort(): Promise<number> {
  const server = createServer()
  await new Promise<void>(resolve => server.listen(0, '127.0.0.1', resolve))
  const { port } = server.address() as { port: number }
  await new Promise(resolve => server.close(resolve))
  return port
}

/** Starts the built server with `env` on top of a production setup; `output` collects what it prints. */
function startApp(env: Record<string, string>, output: string[]): ChildProcess {
  const child = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      NUXT_DATABASE_URL: process.env.NUXT_DATABASE_URL!,
      NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex'),
      NUXT_MAIL_SINK_ENABLED: 'false',
      NUXT_DEMO_SEED: 'false',
      NITRO_HOST: '127.0.0.1',
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  const keep = (chunk: Buffer) => output.push(chunk.toString())
  child.stdout!.on('data', keep)
  child.stderr!.on('data', keep)
  return child
}

function stopApp(child: ChildProcess | undefined): Promise<void> {
  if (!child || child.exitCode !== null || child.signalCode !== null) return Promise.resolve()
  return new Promise((resolve) => {
    const force = setTimeout(() => child.kill('SIGKILL'), 10_000)
    child.once('exit', () => {
      clearTimeout(force)
      resolve()
    })
    child.kill('SIGTERM')
  })
}

let fake: FakeS3
let staging: string
let app: ChildProcess | undefined
const appOutput: string[] = []
let reporter: Client
let editor: Client

beforeAll(async () => {
  fake = await startFakeS3(PREFIX)
  staging = await mkdtemp(join(tmpdir(), 'mantissa-s3-staging-'))
  const port = await freePort()
  const url = `http://127.0.0.1:${port}`
  app = startApp({ ...fake.env, NUXT_STORAGE_BASE: staging, NUXT_JOBS_SCHEMA: 'pgboss_s3_test', PORT: String(port), NUXT_PUBLIC_URL: url }, appOutput)
  try {
    await waitForServer(url, 45)
  }
  catch (error) {
    throw new Error(`${(error as Error).message}\n${appOutput.join('')}`, { cause: error })
  }
  const newsroom = await createTestNewsroom('S3 storage desk')
  reporter = await signedIn(newsroom.emails.reporter, PASSWORD, url)
  editor = await signedIn(newsroom.emails['data-editor'], PASSWORD, url)
}, 90_000)

afterAll(async () => {
  await stopApp(app)
  await fake?.stop()
  if (staging) await rm(staging, { recursive: true, force: true })
})

const keyOf = (sha256: string) => `datasets/${sha256.slice(0, 2)}/${sha256}`

/** The object's bytes as the bucket holds them, hashed. */
async function bucketSha256(sha256: string): Promise<string> {
  return sha256Of(await buffer(await s3Driver(fake.settings).open(keyOf(sha256))))
}

/** Nothing of the upload on the app's local disk: staging is empty, and no content-addressed copy anywhere. */
async function expectNotOnDisk(sha256: string) {
  expect(await readdir(join(staging, 'incoming')).catch(() => [])).toEqual([])
  expect(existsSync(join(staging, 'datasets')), 'a datasets folder in the s3 server\'s staging folder').toBe(false)
  expect(storedFileExists(sha256), 'the file in the first server\'s storage folder').toBe(false)
}

describe('datasets kept in S3 (NUXT_STORAGE_DRIVER=s3)', () => {
  it('upload, import, preview, digit test and delete work with the original only in the bucket', async () => {
    const tag = randomUUID().slice(0, 8)
    const rows = Array.from({ length: 240 }, (_, i) => [`S3 Vendor ${tag} ${i % 7}`, `${10 + ((i + 1) * 7919) % 99_990}.${String(i % 100).padStart(2, '0')}`])
    // A UTF-8 byte-order mark first: the import reads the stored object from just past it (a ranged read).
    const bytes = utf8(`\uFEFFvendor,amount\r\n${rows.map(r => r.join(',')).join('\r\n')}\r\n`)
    const sha256 = sha256Of(bytes)

    const reply = await upload(reporter, 'ledger.csv', bytes, { title: `S3 ledger ${tag}` })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    const id = reply.body.id
    const dataset = (await reporter.get(`/api/datasets/${id}`)).body
    expect(dataset).toMatchObject({ status: 'ready', rowCount: rows.length, sha256, byteSize: bytes.length })
    expect(dataset.columns.map((c: any) => c.name)).toEqual(['vendor', 'amount'])

    expect(await fake.keys()).toContain(`${PREFIX}${keyOf(sha256)}`)
    // Source: node:crypto over the bytes sent.
    expect(await bucketSha256(sha256)).toBe(sha256)
    await expectNotOnDisk(sha256)

    const preview = await reporter.get(`/api/datasets/${id}/preview`)
    expect(preview.status).toBe(200)
    expect(preview.body.total).toBe(rows.length)
    expect(preview.body.items.slice(0, 3).map((r: any) => r.cells)).toEqual(rows.slice(0, 3))

    const result = await reporter.post(`/api/datasets/${id}/digit-tests`, { column: 'amount', test: 'first-digit' })
    expect(result.status, JSON.stringify(result.body)).toBe(200)
    // Computed here from the cells sent: every amount is at least 10, so its first character is its first digit.
    const expected = new Map<string, number>()
    for (const [, amount] of rows) expected.set(amount![0]!, (expected.get(amount![0]!) ?? 0) + 1)
    expect(result.body.n).toBe(rows.length)
    expect(Object.fromEntries(result.body.bins.filter((b: any) => b.count > 0).map((b: any) => [b.key, b.count]))).toEqual(Object.fromEntries(expected))

    // A second dataset of the same bytes shares the object: deleting one keeps it, deleting both removes it.
    const twin = await upload(reporter, 'ledger-again.csv', bytes, { title: `S3 ledger again ${tag}` })
    expect(twin.status, JSON.stringify(twin.body)).toBe(201)
    expect((await reporter.delete(`/api/datasets/${id}`)).status).toBe(200)
    expect((await reporter.get(`/api/datasets/${id}`)).status).toBe(404)
    expect(await fake.keys()).toContain(`${PREFIX}${keyOf(sha256)}`)
    expect((await editor.delete(`/api/datasets/${twin.body.id}`)).status).toBe(200)
    expect(await fake.keys()).not.toContain(`${PREFIX}${keyOf(sha256)}`)
  })

  it('a file over 8 MB is imported by the job from the bucket', async () => {
    const path = join(staging, '..', `${randomUUID()}-big-ledger.csv`)
    const tag = randomUUID().slice(0, 8)
    try {
      const rowCount = await writeLargeCsv(path, ['vendor', 'amount', 'note'], n => [`Queued ${tag} ${n % 13}`, `${(n * 7919) % 100_000}.${String(n % 100).padStart(2, '0')}`, 'kept in the bucket'], QUEUED_BYTES)
      const sha256 = await sha256OfFile(path)
      const reply = await upload(reporter, 'big-ledger.csv', { path }, { title: `S3 big ledger ${tag}` })
      expect(reply.status, JSON.stringify(reply.body)).toBe(202)
      const dataset = await waitUntilSettled(reporter, reply.body.id, JOB_TIMEOUT_MS / 1000 - 10)
      expect(dataset).toMatchObject({ status: 'ready', error: null, rowCount, sha256, byteSize: (await stat(path)).size })
      expect(await bucketSha256(sha256)).toBe(sha256)
      await expectNotOnDisk(sha256)
      const preview = await reporter.get(`/api/datasets/${reply.body.id}/preview`)
      expect(preview.body.items[0].cells).toEqual([`Queued ${tag} 1`, '7919.01', 'kept in the bucket'])
      expect((await reporter.delete(`/api/datasets/${reply.body.id}`)).status).toBe(200)
      expect(await fake.keys()).not.toContain(`${PREFIX}${keyOf(sha256)}`)
    }
    finally {
      await rm(path, { force: true })
    }
  }, JOB_TIMEOUT_MS)

  it('the server refuses to start with the s3 driver and no bucket', async () => {
    const output: string[] = []
    const child = startApp({ NUXT_STORAGE_DRIVER: 's3', NUXT_STORAGE_BASE: staging, PORT: String(await freePort()) }, output)
    const timeout = setTimeout(() => child.kill('SIGKILL'), 20_000)
    const [code] = await new Promise<[number | null]>(resolve => child.once('exit', code => resolve([code])))
    clearTimeout(timeout)
    expect(code, output.join('')).not.toBe(0)
    expect(code, 'ended by the test\'s timeout, not by the server').not.toBeNull()
    expect(output.join('')).toMatch(/NUXT_STORAGE_BUCKET must be set/)
  }, 30_000)
})
