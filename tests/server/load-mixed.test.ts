import { readFile, stat } from 'node:fs/promises'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { Reply } from '../support/api'
import { delimitedText } from '../support/dataset-files'
import { orphanPartitionTables, upload, uploadCsv, waitUntilSettled } from '../support/datasets'
import { sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'

// Issue 18: uploads and analyses at once, more than the server's import slots and database pool
// take, on loopback and bounded in count. Every request gets a proper answer (a 503 only with
// Retry-After), no database connection is left broken, and nothing is half-written.

const UPLOADS = 12
const ANALYSES = 60
const ROWS = 4000

/** The log of the PostgreSQL cluster `npm test` runs (server/cli/postgres.mjs keeps it in .data/). */
const POSTGRES_LOG = join(process.cwd(), '.data', 'pg-test.log')

function ledgerText(seed: number, rows: number): string {
  return delimitedText({ header: ['vendor', 'amount'], rows: Array.from({ length: rows }, (_, i) => [`Supplier ${(i * 7 + seed) % 23}`, String(((i + 1) * 7919 * (seed + 3)) % 99_991 + 10)]) })
}

function expectProperAnswer(reply: Reply, allowed: number[]) {
  if (reply.status === 503) {
    expect(Number(reply.headers.get('retry-after')), 'a 503 says when to try again').toBeGreaterThan(0)
    return
  }
  expect(allowed, `${reply.status}: ${JSON.stringify(reply.body).slice(0, 300)}`).toContain(reply.status)
}

describe('uploads mixed with analyses under load', () => {
  it('answers every request properly, leaves no broken connection and nothing half-written', async () => {
    const desk = await createTestNewsroom('Load desk')
    const datasetId = await uploadCsv(desk.reporter, desk.id, ledgerText(99, 50_000), 'Load analysis ledger')
    const logFrom = (await stat(POSTGRES_LOG)).size

    const uploads = Array.from({ length: UPLOADS }, (_, i) => upload(desk.reporter, `load-${i}.csv`, new TextEncoder().encode(ledgerText(i, ROWS)), { title: `Load ${i}` }, `?newsroomId=${desk.id}`))
    const analyses = Array.from({ length: ANALYSES }, (_, i) => desk['data-editor'].post(`/api/datasets/${datasetId}/digit-tests`, {
      column: 'amount',
      test: ['first-digit', 'first-two-digits', 'second-digit'][i % 3],
      ...(i % 2 ? { groupBy: 'vendor' } : {}),
      ...(i % 4 === 1 ? { filters: [{ column: 'amount', op: 'between', min: 100 }] } : {}),
    }))
    const [uploaded, analysed] = await Promise.all([Promise.all(uploads), Promise.all(analyses)])

    for (const reply of analysed) expectProperAnswer(reply, [200])
    for (const reply of uploaded) expectProperAnswer(reply, [201, 202])
    // Uploads the server could not import at once were queued, never refused or lost.
    const accepted = uploaded.filter(reply => reply.status !== 503)
    for (const reply of accepted) {
      const dataset = await waitUntilSettled(desk.reporter, reply.body.id, 240)
      expect(dataset, JSON.stringify(dataset).slice(0, 300)).toMatchObject({ status: 'ready', rowCount: ROWS })
    }
    expect(await orphanPartitionTables()).toEqual([])

    // Every connection is idle and usable: none left inside a transaction or a COPY.
    const stuck = await sql(`SELECT state, left(query, 80) AS query FROM pg_stat_activity
      WHERE datname = current_database() AND pid <> pg_backend_pid() AND state NOT IN ('idle', 'active')`)
    expect(stuck.rows).toEqual([])
    const logged = (await readFile(POSTGRES_LOG)).subarray(logFrom).toString('utf8')
    expect(logged).not.toMatch(/protocol synchronization was lost|unexpected message type/)

    // The server still answers at once afterwards.
    const after = await desk['data-editor'].post(`/api/datasets/${datasetId}/digit-tests`, { column: 'amount', test: 'first-digit' })
    expect(after.status).toBe(200)
  }, 300_000)
})
