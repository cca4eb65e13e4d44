import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../support/api'
import { sql } from '../support/database'
import { writeLargeCsv } from '../support/dataset-files'
import { orphanPartitionTables, partitionTablesOf, sha256OfFile, upload } from '../support/datasets'
import { startFaultStack } from '../support/fault-stack'
import type { FaultStack } from '../support/fault-stack'
import { proseDoc } from '../support/stories'

// Issue 8: "PostgreSQL stopped abruptly during an import → the dataset is marked failed, no partial
// rows are visible, and after a restart the same upload succeeds; the app restarted during editing →
// every acknowledged save is there." docs/product-rules.md ("Scale"): a restart resumes an import or fails it
// cleanly, never a half-imported dataset. These tests crash a PostgreSQL and an app of their own (fault-stack.ts).

// upload.ts imports files over 8 MB as a job; this one is big enough to still be reading when caught.
const QUEUED_BYTES = 24 * 1024 * 1024
const HEADER = ['payee', 'amount', 'memo']
const rowOf = (n: number) => [`Payee ${n % 211}`, `${(n * 7919) % 1_000_000}.${String(n % 100).padStart(2, '0')}`, `line ${n}`]
const SETTLE_SECONDS = 120

let stack: FaultStack
let scratch: string
beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'mantissa-faults-'))
  stack = await startFaultStack()
}, 180_000)
afterAll(async () => {
  await stack?.stop()
  if (scratch) await rm(scratch, { recursive: true, force: true })
}, 60_000)

const db = (text: string, values: unknown[] = []) => sql(text, values, stack.databaseUrl)
const pause = (ms: number) => new Promise(resolve => setTimeout(resolve, ms))

/** Polls until `check` returns something, tolerating errors (the app may be between databases); fails after `seconds`. */
async function until<T>(what: string, seconds: number, check: () => Promise<T | undefined>, everyMs = 100): Promise<T> {
  const deadline = Date.now() + seconds * 1000
  let last: unknown
  while (Date.now() < deadline) {
    try {
      const found = await check()
      if (found !== undefined) return found
    }
    catch (error) {
      last = error
    }
    await pause(everyMs)
  }
  throw new Error(`${what}: not within ${seconds} s${last ? ` (last error: ${String(last)})` : ''}\n--- app output ---\n${stack.appLog()}`)
}

/** The dataset as the API shows it, once its import no longer runs (answers while the database restarts are skipped). */
function settled(client: Client, id: string) {
  return until(`dataset ${id} settles`, SETTLE_SECONDS, async () => {
    const reply = await client.get(`/api/datasets/${id}`)
    return reply.status === 200 && reply.body.status !== 'importing' ? reply.body : undefined
  }, 250)
}

async function rowsStoredFor(id: string) {
  const { rows: [left] } = await db(`SELECT (SELECT count(*) FROM dataset_rows WHERE dataset_id = $1)::int AS rows,
    (SELECT count(*) FROM digit_records WHERE dataset_id = $1)::int AS digits,
    (SELECT count(*) FROM digit_cube WHERE dataset_id = $1)::int AS cube,
    (SELECT count(*) FROM dataset_columns WHERE dataset_id = $1)::int AS columns`, [id])
  return left
}

describe('PostgreSQL stops abruptly during an import', () => {
  it('fails the dataset with a reason, leaves nothing behind, and the same upload then succeeds', async () => {
    const path = join(scratch, 'payments.csv')
    const rows = await writeLargeCsv(path, HEADER, rowOf, QUEUED_BYTES)
    const reply = await upload(stack.admin, 'payments.csv', { path }, { title: 'Payments before the crash' }, `?newsroomId=${stack.newsroomId}`)
    expect(reply.status, JSON.stringify(reply.body)).toBe(202)
    const id = reply.body.id

    // Caught half-way: the reporter sees "importing" with progress.
    const caught = await until('the import reports progress', 60, async () => {
      const got = await stack.admin.get(`/api/datasets/${id}`)
      expect(got.body.status, 'the import finished before the test could stop PostgreSQL: make the file bigger').toBe('importing')
      return got.body.progress > 0 ? got.body : undefined
    }, 50)
    expect(caught.progress).toBeLessThan(1)
    stack.crashDatabase()
    // The app answers without its database, and says so.
    const during = await stack.admin.get(`/api/datasets/${id}`)
    expect(during.status).toBeGreaterThanOrEqual(500)
    await pause(1000)
    stack.startDatabase()

    // The same app process, its pools reconnecting: no restart of the app.
    const failed = await settled(stack.admin, id)
    expect(failed.status).toBe('failed')
    expect(failed.error).toMatch(/Nothing from this file was kept; upload it again/)
    expect(failed.rowCount).toBeNull()
    expect(failed.columns).toEqual([])
    expect((await stack.admin.get(`/api/datasets/${id}/preview`)).status).toBe(409)
    // Underneath the API: no rows, digit records, counts or columns, and no table left from the import.
    expect(await rowsStoredFor(id)).toEqual({ rows: 0, digits: 0, cube: 0, columns: 0 })
    expect(await partitionTablesOf(id, stack.databaseUrl)).toEqual([])
    expect(await orphanPartitionTables(stack.databaseUrl)).toEqual([])

    const again = await upload(stack.admin, 'payments.csv', { path }, { title: 'Payments, uploaded again' }, `?newsroomId=${stack.newsroomId}`)
    expect(again.status, JSON.stringify(again.body)).toBe(202)
    const ready = await settled(stack.admin, again.body.id)
    expect(ready, ready.error).toMatchObject({ status: 'ready', error: null, rowCount: rows })
    // Source: node:crypto over the file on disk.
    expect(ready.sha256).toBe(await sha256OfFile(path))
    expect(await rowsStoredFor(again.body.id)).toMatchObject({ rows, columns: HEADER.length })
  }, 300_000)
})

describe('the app is killed during editing', () => {
  async function newInvestigation() {
    const created = await stack.admin.post('/api/investigations', { newsroomId: stack.newsroomId, title: `Draft ${Date.now()}` })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    return created.body
  }

  async function blocksNow(investigationId: string) {
    const reply = await stack.admin.get(`/api/investigations/${investigationId}`)
    expect(reply.status).toBe(200)
    return new Map<string, any>(reply.body.blocks.map((b: { id: string }) => [b.id, b]))
  }

  it('keeps every save it acknowledged, up to the last one before the kill', async () => {
    const investigation = await newInvestigation()
    const block = investigation.blocks[0]
    const acknowledged: { version: number, content: unknown }[] = []
    let version = block.version
    for (let i = 1; i <= 8; i++) {
      const content = proseDoc(...Array.from({ length: i }, (_, n) => `Paragraph ${n + 1} of the draft. `))
      const saved = await stack.admin.patch(`/api/blocks/${block.id}`, { version, content })
      expect(saved.status, JSON.stringify(saved.body)).toBe(200)
      version = saved.body.version
      acknowledged.push({ version, content })
    }
    // Killed right after the last acknowledgement, before anything else could happen.
    await stack.killApp()
    await stack.startApp()

    const stored = (await blocksNow(investigation.id)).get(block.id)
    const last = acknowledged.at(-1)!
    expect(stored.version).toBe(last.version)
    expect(stored.content).toEqual(last.content)
    expect(acknowledged.map(a => a.version)).toEqual(Array.from({ length: 8 }, (_, i) => block.version + 1 + i))
  }, 120_000)

  it('a save in flight when the app dies is either all there or not there at all', async () => {
    const investigation = await newInvestigation()
    const ids: string[] = [investigation.blocks[0].id]
    for (let i = 1; i < 6; i++) {
      const added = await stack.admin.post(`/api/investigations/${investigation.id}/blocks`, { kind: 'prose', content: proseDoc(`Block ${i} before.`) })
      expect(added.status, JSON.stringify(added.body)).toBe(201)
      ids.push(added.body.id)
    }
    const before = await blocksNow(investigation.id)
    const after = new Map(ids.map((id, i) => [id, proseDoc(`Block ${i} after, a longer sentence that replaces the first one.`)]))
    // Six saves sent a few milliseconds apart; the kill lands among them, so some may commit and some not.
    const inFlight = ids.map(async (id, i) => {
      await pause(3 * i)
      return stack.admin.patch(`/api/blocks/${id}`, { version: before.get(id).version, content: after.get(id) }).catch(() => null)
    })
    await pause(8)
    await stack.killApp()
    const replies = await Promise.all(inFlight)
    await stack.startApp()

    const now = await blocksNow(investigation.id)
    for (const [i, id] of ids.entries()) {
      const was = before.get(id)
      const is = now.get(id)
      const landed = is.version === was.version + 1
      if (landed) expect(is.content, `block ${i}`).toEqual(after.get(id))
      else expect(is, `block ${i}`).toMatchObject({ version: was.version, content: was.content })
      // A save whose 200 reached the client is there.
      if (replies[i]?.status === 200) expect(landed, `block ${i} was acknowledged`).toBe(true)
    }
  }, 120_000)

  it('an inline import whose server died is failed by the next server, with nothing left behind', async () => {
    const path = join(scratch, 'small.csv')
    await writeLargeCsv(path, HEADER, rowOf, 6 * 1024 * 1024)
    const title = `Inline import ${Date.now()}`
    const uploading = upload(stack.admin, 'small.csv', { path }, { title }, `?newsroomId=${stack.newsroomId}`).catch(() => null)
    const { id } = await until('the inline import starts', 60, async () => {
      const { rows } = await db(`SELECT id FROM datasets WHERE title = $1 AND status = 'importing'`, [title])
      return rows[0]
    }, 20)
    await stack.killApp()
    expect(await uploading, 'the upload was answered before the kill').toBeNull()
    // Ten minutes pass (import-job.ts gives an inline import that long) while no server runs it.
    await db(`UPDATE datasets SET created_at = created_at - interval '11 minutes' WHERE id = $1`, [id])
    await stack.startApp()

    const failed = await settled(stack.admin, id)
    expect(failed.status).toBe('failed')
    expect(failed.error).toMatch(/server running it went away.*upload it again/)
    expect(await rowsStoredFor(id)).toEqual({ rows: 0, digits: 0, cube: 0, columns: 0 })
    expect(await partitionTablesOf(id, stack.databaseUrl)).toEqual([])
  }, 120_000)
})
