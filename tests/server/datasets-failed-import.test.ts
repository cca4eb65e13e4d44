import { mkdtemp, rm, stat } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { writeLargeCsv } from '../support/dataset-files'
import { sql } from '../support/database'
import { partitionTablesOf, sha256OfFile, upload, waitUntilSettled } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

// upload.ts imports files up to 8 MB while the request waits; larger ones go to the job queue.
const QUEUED_BYTES = 9 * 1024 * 1024
const HEADER = ['vendor', 'amount', 'note']
// A 9 MB import takes seconds, more when other test files run beside it.
const JOB_TIMEOUT_MS = 120_000
const rowOf = (n: number) => [`Queued Vendor ${n % 97}`, `${(n * 7919) % 100_000}.${String(n % 100).padStart(2, '0')}`, 'ok']

let newsroom: TestNewsroom
let scratch: string
beforeAll(async () => {
  newsroom = await createTestNewsroom('Queued imports desk')
  scratch = await mkdtemp(join(tmpdir(), 'mantissa-queued-'))
})
afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

describe('imports that run as a job', () => {
  it('a file over 8 MB answers 202, then becomes ready with every row', async () => {
    const path = join(scratch, 'big-ledger.csv')
    const rows = await writeLargeCsv(path, HEADER, rowOf, QUEUED_BYTES)
    const reply = await upload(newsroom.reporter, 'big-ledger.csv', { path })
    expect(reply.status, JSON.stringify(reply.body)).toBe(202)
    expect(reply.body.status).toBe('importing')
    const dataset = await waitUntilSettled(newsroom.reporter, reply.body.id)
    expect(dataset).toMatchObject({ status: 'ready', error: null, rowCount: rows, byteSize: (await stat(path)).size })
    // Source: node:crypto over the file on disk.
    expect(dataset.sha256).toBe(await sha256OfFile(path))
    const hex = dataset.id.replaceAll('-', '')
    // A ready dataset keeps its rows, digit records and digit counts; the import's own dictionary table is gone.
    expect(await partitionTablesOf(dataset.id)).toEqual([`dataset_rows_${hex}`, `digit_cube_${hex}`, `digit_records_${hex}`])
  }, JOB_TIMEOUT_MS)

  it('a file broken near its end fails with a reason and leaves nothing visible', async () => {
    const path = join(scratch, 'cut-off-ledger.csv')
    // Every row is fine except the last, whose quoted note is never closed (a download cut short).
    await writeLargeCsv(path, HEADER, rowOf, QUEUED_BYTES, 'Cut Short Ltd,12.50,"the export stopped here\r\n')
    const reply = await upload(newsroom.reporter, 'cut-off-ledger.csv', { path })
    expect(reply.status, JSON.stringify(reply.body)).toBe(202)
    const id = reply.body.id
    const dataset = await waitUntilSettled(newsroom.reporter, id)
    expect(dataset.status).toBe('failed')
    expect(dataset.error).toMatch(/quoted cell that is never closed/)
    expect(dataset.rowCount).toBeNull()
    expect(dataset.columns).toEqual([])

    const client = newsroom.reporter
    expect((await client.get(`/api/datasets/${id}/preview`)).status).toBe(409)
    expect((await client.post(`/api/datasets/${id}/digit-tests`, { column: 'amount', test: 'first-digit' })).status).toBe(409)
    expect((await client.get(`/api/datasets/${id}/rows?column=amount&key=1`)).status).toBe(409)

    // Underneath the API: no staged tables left, and nothing of this dataset in the partitioned tables.
    expect(await partitionTablesOf(id)).toEqual([])
    const left = await sql(`SELECT (SELECT count(*) FROM dataset_rows WHERE dataset_id = $1)::int AS rows,
      (SELECT count(*) FROM digit_records WHERE dataset_id = $1)::int AS digits,
      (SELECT count(*) FROM dataset_columns WHERE dataset_id = $1)::int AS columns`, [id])
    expect(left.rows[0]).toEqual({ rows: 0, digits: 0, columns: 0 })
  }, JOB_TIMEOUT_MS)
})
