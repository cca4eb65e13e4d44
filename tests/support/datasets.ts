import { createHash } from 'node:crypto'
import { createReadStream, existsSync, openAsBlob } from 'node:fs'
import { readdir } from 'node:fs/promises'
import { ReadableStream } from 'node:stream/web'
import { join, resolve } from 'node:path'
import { expect } from 'vitest'
import type { Client, Reply } from './api'
import { sql } from './database'

/** The app's file storage folder; `npm test` passes the one it gave the server. */
export const storageBase = resolve(process.env.NUXT_STORAGE_BASE ?? '.data/test-files')

/** Bytes in memory, or a file on disk sent without reading it into memory. */
export type UploadBody = Uint8Array | { path: string }

async function blobOf(body: UploadBody): Promise<Blob> {
  // The type allows a SharedArrayBuffer behind the bytes, which Blob refuses; the tests' bytes never have one.
  return body instanceof Uint8Array ? new Blob([body as Uint8Array<ArrayBuffer>]) : await openAsBlob(body.path)
}

/** POST /api/datasets as the scripting API describes it: multipart with `file` and `title`. */
export async function upload(client: Client, fileName: string, body: UploadBody, fields: Record<string, string> = {}, query = ''): Promise<Reply> {
  const form = new FormData()
  form.append('title', fields.title ?? `Test upload ${fileName}`)
  for (const [name, value] of Object.entries(fields)) if (name !== 'title') form.append(name, value)
  form.append('file', await blobOf(body), fileName)
  return client.request('POST', `/api/datasets${query}`, form)
}

/**
 * POST /api/datasets with a multipart body written by hand and streamed: the file's bytes at once,
 * the closing boundary `pauseMs` later, as a slow connection delivers it.
 */
export async function uploadWithLateEnd(client: Client, fileName: string, path: string, pauseMs: number): Promise<Reply> {
  const boundary = `----mantissa-test-${Date.now()}`
  const head = `--${boundary}\r\nContent-Disposition: form-data; name="title"\r\n\r\nLate end\r\n`
    + `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`
  async function* parts() {
    yield new TextEncoder().encode(head)
    for await (const chunk of createReadStream(path)) yield new Uint8Array(chunk as Buffer)
    await new Promise(r => setTimeout(r, pauseMs))
    yield new TextEncoder().encode(`\r\n--${boundary}--\r\n`)
  }
  return client.request('POST', '/api/datasets', ReadableStream.from(parts()), { 'content-type': `multipart/form-data; boundary=${boundary}` })
}

/** Uploads a small file, expects the inline import to answer 201, and returns GET /api/datasets/{id}. */
export async function uploadReady(client: Client, fileName: string, body: UploadBody): Promise<any> {
  const reply = await upload(client, fileName, body)
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  expect(reply.body.status).toBe('ready')
  const got = await client.get(`/api/datasets/${reply.body.id}`)
  expect(got.status).toBe(200)
  return got.body
}

/** Polls GET /api/datasets/{id} until the import is no longer running. */
export async function waitUntilSettled(client: Client, id: string, seconds = 90): Promise<any> {
  const until = Date.now() + seconds * 1000
  while (Date.now() < until) {
    const reply = await client.get(`/api/datasets/${id}`)
    expect(reply.status).toBe(200)
    if (reply.body.status !== 'importing') return reply.body
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`dataset ${id} still importing after ${seconds} s`)
}

export function sha256Of(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex')
}

export async function sha256OfFile(path: string): Promise<string> {
  const hash = createHash('sha256')
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer)
  return hash.digest('hex')
}

/** Where file-store.ts keeps an upload: under its SHA-256. */
export function storedFileExists(sha256: string): boolean {
  return existsSync(join(storageBase, 'datasets', sha256.slice(0, 2), sha256))
}

/** The dataset's own partition tables (partitions.ts names them from the uuid's hex). */
export async function partitionTablesOf(datasetId: string, url?: string): Promise<string[]> {
  const hex = datasetId.replaceAll('-', '')
  const result = await sql<{ relname: string }>(`SELECT relname FROM pg_class WHERE relname = ANY($1)`, [['dataset_rows', 'digit_records', 'digit_cube', 'import_group_values'].map(table => `${table}_${hex}`)], url)
  return result.rows.map(r => r.relname).sort()
}

/**
 * Partition and staging tables whose dataset row is gone. An import creates its tables after the
 * dataset row and drops them before the row, so at any moment there should be none.
 */
export async function orphanPartitionTables(url?: string): Promise<string[]> {
  const result = await sql<{ relname: string }>(`
    SELECT c.relname FROM pg_class c
    WHERE c.relkind IN ('r', 'p') AND c.relname ~ '^(dataset_rows|digit_records|digit_cube|import_group_values)_[0-9a-f]{32}$'
      AND NOT EXISTS (SELECT 1 FROM datasets d WHERE replace(d.id::text, '-', '') = substring(c.relname from '[0-9a-f]{32}$'))`, [], url)
  return result.rows.map(r => r.relname)
}

/** Files of uploads in flight; each must be gone (moved under its hash, or removed) soon after its reply. */
export async function incomingFiles(): Promise<string[]> {
  return readdir(join(storageBase, 'incoming')).catch(() => [])
}

/** Waits until none of `names` is left in storage's incoming folder (other tests' uploads finish within seconds). */
export async function expectIncomingGone(names: string[], seconds = 20) {
  const until = Date.now() + seconds * 1000
  let left = names
  while (Date.now() < until) {
    const now = new Set(await incomingFiles())
    left = names.filter(name => now.has(name))
    if (!left.length) return
    await new Promise(r => setTimeout(r, 200))
  }
  expect(left, 'upload files left in storage/incoming').toEqual([])
}

/** Every page of a paged route (preview or drill-down), concatenated. */
export async function allPages(client: Client, path: string): Promise<{ total: number, pages: any[], items: any[] }> {
  const pages: any[] = []
  for (let page = 1; ; page++) {
    const reply = await client.get(`${path}${path.includes('?') ? '&' : '?'}page=${page}`)
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    pages.push(reply.body)
    if (page * reply.body.pageSize >= reply.body.total) break
  }
  return { total: pages[0].total, pages, items: pages.flatMap(p => p.items) }
}

/** Uploads CSV text into a newsroom and returns the dataset's id; fails unless it imported at once. */
export async function uploadCsv(client: Client, newsroomId: string, csv: string, title = 'Fixture'): Promise<string> {
  const reply = await upload(client, `${title.replace(/\W+/g, '-')}.csv`, new TextEncoder().encode(csv), { title }, `?newsroomId=${newsroomId}`)
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  return reply.body.id
}
