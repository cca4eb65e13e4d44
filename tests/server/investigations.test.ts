import { describe, expect, it } from 'vitest'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { uploadCsv } from '../support/datasets'

const paragraph = (text: string) => ({ type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text }] }] })

async function newInvestigation() {
  const newsroom = await createTestNewsroom()
  const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'Test story' })
  expect(created.status).toBe(201)
  return { newsroom, investigation: created.body }
}

describe('investigations and blocks', () => {
  it('starts with one empty text block and lists the investigation for the newsroom', async () => {
    const { newsroom, investigation } = await newInvestigation()
    expect(investigation.blocks).toHaveLength(1)
    expect(investigation.blocks[0]).toMatchObject({ kind: 'prose', version: 1 })
    const list = await newsroom['fact-checker'].get(`/api/investigations?newsroomId=${newsroom.id}`)
    expect(list.body.map((i: { id: string }) => i.id)).toEqual([investigation.id])
  })

  it('starts a draft from a dataset in one request: the empty paragraph, then its first analysis', async () => {
    const newsroom = await createTestNewsroom()
    const datasetId = await uploadCsv(newsroom.reporter, newsroom.id, 'amount\n120\n345\n1890\n', 'Start from it')
    const firstAnalysis = { datasetId, column: 'amount', test: 'first-digit' }
    const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'On Start from it', firstAnalysis })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body.blocks).toMatchObject([{ kind: 'prose', position: 0, version: 1 }, { kind: 'analysis', position: 1, version: 1, settings: firstAnalysis, review: { status: 'unreviewed' } }])
    const trail = await newsroom.reporter.get(`/api/investigations/${created.body.id}/audit`)
    const own = trail.body.events.filter((e: { subjectId: string }) => [created.body.id, created.body.blocks[1].id].includes(e.subjectId))
    expect(own.map((e: { action: string }) => e.action).sort()).toEqual(['block.added', 'investigation.created'])
    const history = await newsroom.reporter.get(`/api/blocks/${created.body.blocks[1].id}/versions`)
    expect(history.body.versions).toMatchObject([{ version: 1, change: 'created' }])
  })

  it.each([
    ['another newsroom\'s dataset', (other: TestNewsroom) => uploadCsv(other.reporter, other.id, 'amount\n120\n345\n', 'Not theirs')],
    ['a dataset that does not exist', async () => '00000000-0000-4000-8000-000000000000'],
  ])('refuses a first analysis of %s and leaves no investigation behind', async (_, datasetOf) => {
    const newsroom = await createTestNewsroom()
    const other = await createTestNewsroom('Other desk')
    const datasetId = await datasetOf(other)
    const refused = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'Borrowed', firstAnalysis: { datasetId, column: 'amount', test: 'first-digit' } })
    expect(refused.status, JSON.stringify(refused.body)).toBe(400)
    expect(refused.body.data).toEqual([{ path: 'firstAnalysis.datasetId', message: 'Choose a dataset of this newsroom.' }])
    const list = await newsroom.reporter.get(`/api/investigations?newsroomId=${newsroom.id}`)
    expect(list.body).toEqual([])
  })

  it('inserts blocks where asked and reorders them', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const first = investigation.blocks[0].id
    const analysis = await newsroom.reporter.post(`/api/investigations/${investigation.id}/blocks`, { kind: 'analysis', afterBlockId: first })
    const intro = await newsroom.reporter.post(`/api/investigations/${investigation.id}/blocks`, { kind: 'prose', afterBlockId: null })
    expect(analysis.status).toBe(201)
    let doc = (await newsroom.reporter.get(`/api/investigations/${investigation.id}`)).body
    expect(doc.blocks.map((b: { id: string }) => b.id)).toEqual([intro.body.id, first, analysis.body.id])

    const reordered = await newsroom.reporter.post(`/api/investigations/${investigation.id}/order`, {
      layoutVersion: doc.layoutVersion, blockIds: [analysis.body.id, intro.body.id, first],
    })
    expect(reordered.status).toBe(200)
    doc = (await newsroom.reporter.get(`/api/investigations/${investigation.id}`)).body
    expect(doc.blocks.map((b: { id: string }) => b.id)).toEqual([analysis.body.id, intro.body.id, first])
    expect(doc.blocks.map((b: { position: number }) => b.position)).toEqual([0, 1, 2])

    const stale = await newsroom.reporter.post(`/api/investigations/${investigation.id}/order`, {
      layoutVersion: reordered.body.layoutVersion - 1, blockIds: [first, intro.body.id, analysis.body.id],
    })
    expect(stale.status).toBe(409)
  })

  it('answers 409 with the current block to a save against a stale version, and loses nothing', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const block = investigation.blocks[0]
    const mine = await newsroom.reporter.patch(`/api/blocks/${block.id}`, { version: 1, content: paragraph('First draft.') })
    expect(mine.status).toBe(200)
    expect(mine.body.version).toBe(2)
    const editor = await newsroom['data-editor'].patch(`/api/blocks/${block.id}`, { version: 2, content: paragraph('Edited by the desk.') })
    expect(editor.body.version).toBe(3)
    const stale = await newsroom.reporter.patch(`/api/blocks/${block.id}`, { version: 2, content: paragraph('Second draft.') })
    expect(stale.status).toBe(409)
    expect(stale.body.data.current).toMatchObject({ id: block.id, version: 3, content: paragraph('Edited by the desk.') })
    const kept = await newsroom.reporter.patch(`/api/blocks/${block.id}`, { version: 3, content: paragraph('Second draft.') })
    expect(kept.body).toMatchObject({ version: 4, content: paragraph('Second draft.') })
  })

  it('removes a block and brings it back', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const added = await newsroom.reporter.post(`/api/investigations/${investigation.id}/blocks`, { kind: 'prose', content: paragraph('Keep me') })
    expect((await newsroom.reporter.delete(`/api/blocks/${added.body.id}`)).status).toBe(200)
    expect((await newsroom.reporter.get(`/api/investigations/${investigation.id}`)).body.blocks).toHaveLength(1)
    expect((await newsroom.reporter.post(`/api/blocks/${added.body.id}/restore`)).status).toBe(200)
    const doc = (await newsroom.reporter.get(`/api/investigations/${investigation.id}`)).body
    expect(doc.blocks.map((b: { content: unknown }) => b.content)).toContainEqual(paragraph('Keep me'))
  })

  it('runs an analysis block, then answers the same result from the cache', async () => {
    const { newsroom, investigation } = await newInvestigation()
    // 2^0 … 2^99: first-digit counts 30,17,13,10,7,7,6,5,5 (docs/check-values.md, exact integer arithmetic).
    const csv = `amount\n${Array.from({ length: 100 }, (_, i) => (2n ** BigInt(i)).toString()).join('\n')}\n`
    const datasetId = await uploadCsv(newsroom.reporter, newsroom.id, csv, 'Powers of two')
    const block = await newsroom.reporter.post(`/api/investigations/${investigation.id}/blocks`, {
      kind: 'analysis', settings: { datasetId, column: 'amount', test: 'first-digit' },
    })
    expect((await newsroom.reporter.get(`/api/blocks/${block.body.id}/analysis`)).body).toBeNull()
    const run = await newsroom.reporter.post(`/api/blocks/${block.body.id}/run`)
    expect(run.status).toBe(200)
    expect(run.body.cached).toBe(false)
    expect(run.body.result.bins.map((b: { count: number }) => b.count)).toEqual([30, 17, 13, 10, 7, 7, 6, 5, 5])
    expect(run.body.result.mad.value).toBeCloseTo(0.003879, 5)
    const again = await newsroom['fact-checker'].get(`/api/blocks/${block.body.id}/analysis`)
    expect(again.body).toEqual({ result: run.body.result, cached: true })
  })

  it('refuses a dataset of another newsroom in a block', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const other = await createTestNewsroom('Other')
    const foreign = await uploadCsv(other.reporter, other.id, 'amount\n12\n', 'Theirs')
    const reply = await newsroom.reporter.post(`/api/investigations/${investigation.id}/blocks`, { kind: 'analysis', settings: { datasetId: foreign } })
    expect(reply.status).toBe(400)
    expect(reply.body.data[0].path).toBe('settings.datasetId')
  })
})

describe('who may change an investigation', () => {
  it('lets its reporter and data editors edit; other reporters and fact-checkers read only; other newsrooms get 404', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const block = investigation.blocks[0]
    const outsider = await createTestNewsroom('Outside')

    expect((await newsroom['fact-checker'].get(`/api/investigations/${investigation.id}`)).status).toBe(200)
    expect((await newsroom['fact-checker'].patch(`/api/blocks/${block.id}`, { version: 1, content: paragraph('x') })).status).toBe(403)
    expect((await newsroom['fact-checker'].post('/api/investigations', { newsroomId: newsroom.id, title: 'Mine' })).status).toBe(403)
    expect((await newsroom['data-editor'].patch(`/api/investigations/${investigation.id}`, { title: 'Renamed by the desk', titleVersion: 1 })).status).toBe(200)
    expect((await outsider.reporter.get(`/api/investigations/${investigation.id}`)).status).toBe(404)
    expect((await outsider['data-editor'].patch(`/api/blocks/${block.id}`, { version: 1, content: paragraph('x') })).status).toBe(404)
    expect((await outsider.admin.get(`/api/investigations?newsroomId=${newsroom.id}`)).status).toBe(404)
  })

  it('keeps another reporter of the same newsroom out of someone else\'s draft', async () => {
    const { newsroom, investigation } = await newInvestigation()
    const mine = await newsroom.admin.post('/api/investigations', { newsroomId: newsroom.id, title: 'Admin story' })
    const block = mine.body.blocks[0]
    expect((await newsroom.reporter.patch(`/api/blocks/${block.id}`, { version: 1, content: paragraph('x') })).status).toBe(403)
    expect((await newsroom.reporter.get(`/api/investigations/${mine.body.id}`)).status).toBe(200)
    expect(investigation.id).not.toBe(mine.body.id)
  })
})
