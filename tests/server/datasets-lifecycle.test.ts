import { beforeAll, describe, expect, it } from 'vitest'
import { utf8 } from '../support/dataset-files'
import { sql } from '../support/database'
import { partitionTablesOf, sha256Of, storedFileExists, upload, uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let newsroom: TestNewsroom
beforeAll(async () => {
  newsroom = await createTestNewsroom('Lifecycle desk')
})

const file = (label: string) => utf8(`vendor,amount\r\n${label} Lifecycle Ltd,120.50\r\n${label} Other Ltd,75\r\n`)

describe('archive, replace and delete', () => {
  it('archives a dataset: still readable, marked archived in the list', async () => {
    const dataset = await uploadReady(newsroom.reporter, 'archived.csv', file('Archived'))
    expect((await newsroom.reporter.post(`/api/datasets/${dataset.id}/archive`)).status).toBe(200)
    const list = await newsroom.reporter.get(`/api/datasets?newsroomId=${newsroom.id}`)
    expect(list.body.find((d: any) => d.id === dataset.id)).toMatchObject({ archived: true, status: 'ready' })
    expect((await newsroom.reporter.get(`/api/datasets/${dataset.id}/preview`)).status).toBe(200)
  })

  it('names the dataset a corrected upload replaces', async () => {
    const first = await uploadReady(newsroom.reporter, 'first.csv', file('First'))
    const reply = await upload(newsroom.reporter, 'corrected.csv', file('Corrected'), { title: 'Corrected', replacesId: first.id })
    expect(reply.status).toBe(201)
    expect((await newsroom.reporter.get(`/api/datasets/${reply.body.id}`)).body.replacesId).toBe(first.id)
  })

  it('deletes a dataset with its partitions and stored file, keeping a file another dataset shares', async () => {
    const bytes = file('Deleted')
    const sha256 = sha256Of(bytes)
    const one = await uploadReady(newsroom.reporter, 'shared.csv', bytes)
    const two = await uploadReady(newsroom.reporter, 'shared-again.csv', bytes)
    expect(two.sha256).toBe(sha256)

    // Asked once before the delete: the server then knows its newsroom (findPermittedDataset in catalog.ts).
    const question = { column: 'amount', test: 'first-digit' }
    expect((await newsroom.reporter.post(`/api/datasets/${one.id}/digit-tests`, question)).status).toBe(200)
    expect((await newsroom.reporter.delete(`/api/datasets/${one.id}`)).status).toBe(200)
    expect((await newsroom.reporter.get(`/api/datasets/${one.id}`)).status).toBe(404)
    expect((await newsroom.reporter.post(`/api/datasets/${one.id}/digit-tests`, question)).status).toBe(404)
    expect((await newsroom.reporter.get(`/api/datasets/${one.id}/rows?column=amount&key=1`)).status).toBe(404)
    expect(await partitionTablesOf(one.id)).toEqual([])
    expect(storedFileExists(sha256), 'the second dataset still holds these bytes').toBe(true)

    expect((await newsroom['data-editor'].delete(`/api/datasets/${two.id}`)).status).toBe(200)
    expect(await partitionTablesOf(two.id)).toEqual([])
    expect(storedFileExists(sha256)).toBe(false)
    const left = await sql(`SELECT (SELECT count(*) FROM dataset_rows WHERE dataset_id = ANY($1::uuid[]))::int AS rows,
      (SELECT count(*) FROM dataset_columns WHERE dataset_id = ANY($1::uuid[]))::int AS columns`, [[one.id, two.id]])
    expect(left.rows[0]).toEqual({ rows: 0, columns: 0 })
  })
})
