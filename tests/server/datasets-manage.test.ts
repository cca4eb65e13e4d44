import { writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import type { DatasetSummaryDTO } from '../../shared/types/dataset'
import { utf8 } from '../support/dataset-files'
import { sha256Of, storageBase, upload } from '../support/datasets'
import { sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { writeStory } from '../support/stories'

// Issue 19: datasets a reporter can find, tell apart, put away and bring back, and whose original
// bytes come out as they went in, checked against the fingerprint taken at upload.

let desk: TestNewsroom
const LEDGER = utf8('supplier,amount\r\nNorthgate Paving,1840.00\r\nQuay Lighting,1215.50\r\n')
const CORRECTED = utf8('supplier,amount\r\nNorthgate Paving,1840.00\r\nQuay Lighting,1251.50\r\n')

async function uploaded(fileName: string, bytes: Uint8Array, fields: Record<string, string>): Promise<string> {
  const reply = await upload(desk.reporter, fileName, bytes, fields, `?newsroomId=${desk.id}`)
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  return reply.body.id
}

const list = async (q?: string): Promise<DatasetSummaryDTO[]> => {
  const reply = await desk.reporter.get(`/api/datasets?newsroomId=${desk.id}${q === undefined ? '' : `&q=${encodeURIComponent(q)}`}`)
  expect(reply.status).toBe(200)
  return reply.body
}

let first: string
let second: string
beforeAll(async () => {
  desk = await createTestNewsroom('Dataset shelf')
  first = await uploaded('harbour-2025.csv', LEDGER, { title: 'Harbour payments', sourceNote: 'From the port authority\'s records office', obtainedOn: '2026-03-02' })
  second = await uploaded('harbour-2025-corrected.csv', CORRECTED, { title: 'Harbour payments', obtainedOn: '2026-04-10', replacesId: first })
})

describe('finding datasets', () => {
  it('searches titles, source notes and file names, and tells two datasets of one title apart', async () => {
    expect((await list('records office')).map(d => d.id)).toEqual([first])
    expect((await list('CORRECTED')).map(d => d.id)).toEqual([second])
    expect((await list('harbour')).map(d => d.id)).toEqual([second, first])
    // A search is text, not a pattern: "%" finds only a literal percent sign.
    expect(await list('%')).toEqual([])
    const [newer, older] = await list('Harbour payments')
    expect(newer).toMatchObject({ title: 'Harbour payments', obtainedOn: '2026-04-10', sha256: sha256Of(CORRECTED), rowCount: 2 })
    expect(older).toMatchObject({ title: 'Harbour payments', obtainedOn: '2026-03-02', sha256: sha256Of(LEDGER) })
  })
})

describe('putting away and bringing back', () => {
  it('archives and restores, with both in the audit trail', async () => {
    expect((await desk.reporter.post(`/api/datasets/${first}/archive`)).status).toBe(200)
    expect((await list()).find(d => d.id === first)?.archived).toBe(true)
    expect((await desk.reporter.post(`/api/datasets/${first}/restore`)).status).toBe(200)
    expect((await list()).find(d => d.id === first)?.archived).toBe(false)
    const actions = (await sql(`SELECT action FROM audit_events WHERE subject_id = $1 ORDER BY created_at`, [first])).rows.map(r => r.action)
    expect(actions).toEqual(expect.arrayContaining(['dataset.archived', 'dataset.restored']))
  })

  it('refuses to delete a dataset an investigation uses (409), and deletes one no story uses', async () => {
    await writeStory(desk.reporter, desk.id, second)
    const refused = await desk.reporter.delete(`/api/datasets/${second}`)
    expect(refused.status).toBe(409)
    expect(refused.body.data.message).toMatch(/uses this dataset/)
    const spare = await uploaded('spare.csv', utf8('supplier,amount\r\nWillow Drains,143.20\r\n'), { title: 'Spare ledger' })
    expect((await desk.reporter.delete(`/api/datasets/${spare}`)).status).toBe(200)
    expect((await desk.reporter.get(`/api/datasets/${spare}`)).status).toBe(404)
  })
})

describe('the original bytes', () => {
  it('come out as they were uploaded, under the original name, with their fingerprint', async () => {
    const response = await fetch(`${desk.reporter.base}/api/datasets/${first}/original`, { headers: { cookie: desk.reporter.cookie } })
    expect(response.status).toBe(200)
    expect(response.headers.get('content-disposition')).toBe('attachment; filename*=UTF-8\'\'harbour-2025.csv')
    expect(response.headers.get('x-content-sha256')).toBe(sha256Of(LEDGER))
    expect(new Uint8Array(await response.arrayBuffer())).toEqual(LEDGER)
  })

  it('are refused when the stored file no longer matches its fingerprint', async () => {
    const bytes = utf8('supplier,amount\r\nMill Lane Timber,310.00\r\n')
    const id = await uploaded('timber.csv', bytes, { title: 'Timber ledger' })
    const sha = sha256Of(bytes)
    await writeFile(join(storageBase, 'datasets', sha.slice(0, 2), sha), 'supplier,amount\r\nMill Lane Timber,910.00\r\n')
    const reply = await desk.reporter.get(`/api/datasets/${id}/original`)
    expect(reply.status).toBe(500)
    expect(reply.body.data.message).toMatch(/no longer matches the fingerprint/)
  })
})
