import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { expectStatus, saveBlock, uploadPayments, writeStory } from '../support/stories'

// Issue 20: "Compare with published: beside each publication, what changed since, block by block."
// docs/product-rules.md ("Frozen snapshots", "History"): a publication is a frozen snapshot; later
// edits do not reach the public link until the next publish. The texts below are written here; the expected differences follow
// from them word for word.

interface Change { blockId: string | null, label: string, change: 'added' | 'removed' | 'changed', diff: any }

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Compare')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

const paragraphs = (...texts: string[]) => ({ type: 'doc', content: texts.map(text => ({ type: 'paragraph', content: [{ type: 'text', text }] })) })

async function publishedStory() {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('Nine suppliers were paid in March.') }), 200)
  const extra = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: paragraphs('A paragraph that will go.') })
  expectStatus(extra, 201)
  const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Checks are open; this test publishes anyway.' })
  expectStatus(published, 201)
  return { story, removable: extra.body.id as string, publicationId: published.body.link.publicationId as string }
}

async function changes(client: Client, publicationId: string) {
  const reply = await client.get(`/api/publications/${publicationId}/changes`)
  expectStatus(reply, 200)
  return reply.body as { matchedBy: string, changes: Change[], unchanged: number, publishedAt: string }
}

describe('what changed since a publication', () => {
  it('says nothing changed right after publishing', async () => {
    const { publicationId } = await publishedStory()
    const now = await changes(newsroom['fact-checker'], publicationId)
    expect(now).toMatchObject({ matchedBy: 'version', changes: [], unchanged: 3 })
  })

  it('lists blocks changed (with the words), settings changed (old and new), added and removed', async () => {
    const { story, removable, publicationId } = await publishedStory()
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('Eleven suppliers were paid in March.') }), 200)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
    expectStatus(await newsroom.reporter.delete(`/api/blocks/${removable}`), 200)
    const added = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: paragraphs('Written after publication.') })
    expectStatus(added, 201)

    const { changes: list, unchanged } = await changes(newsroom.reporter, publicationId)
    expect(unchanged).toBe(0)
    const byBlock = new Map(list.map(c => [c.blockId, c]))
    const prose = byBlock.get(story.proseBlockId)!
    expect(prose.change).toBe('changed')
    expect(prose.label).toBe('Block 1 (text), “Eleven suppliers were paid in March.”')
    expect(prose.diff.text.filter((p: any) => p.change === 'removed').map((p: any) => p.text)).toEqual(['Nine'])
    expect(prose.diff.text.filter((p: any) => p.change === 'added').map((p: any) => p.text)).toEqual(['Eleven'])
    const analysis = byBlock.get(story.analysisBlockId)!
    expect(analysis.change).toBe('changed')
    expect(analysis.diff.settings.filter((s: any) => s.changed)).toEqual([{ field: 'test', label: 'Test', before: 'First digit', after: 'Second digit', changed: true }])
    expect(byBlock.get(added.body.id)).toMatchObject({ change: 'added', label: 'Block 3 (text), “Written after publication.”' })
    expect(byBlock.get(removable)).toMatchObject({ change: 'removed', label: 'Removed text block, “A paragraph that will go.”' })
    expect(list).toHaveLength(4)
    // The public link still shows what was published (docs/product-rules.md, "Frozen snapshots").
    const link = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
    const address = new URL(link.body.links[0].url)
    const page = await new Client().get(`/api/public/${address.pathname.split('/').at(-1)}`)
    expect(JSON.stringify(page.body.blocks)).toContain('Nine suppliers')
  })

  it('matches an older publication, made before versions were kept, by content and order', async () => {
    const { story, publicationId } = await publishedStory()
    // As a publication from before migration 0070 has it: the snapshot without the frozen versions.
    await sql('UPDATE publications SET block_versions = NULL WHERE id = $1', [publicationId])
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('Ten suppliers were paid in March.') }), 200)
    const { matchedBy, changes: list, unchanged } = await changes(newsroom.reporter, publicationId)
    expect(matchedBy).toBe('content')
    expect(unchanged).toBe(2)
    expect(list).toHaveLength(1)
    expect(list[0]).toMatchObject({ blockId: story.proseBlockId, change: 'changed' })
    expect(list[0]!.diff.text.filter((p: any) => p.change !== 'same').map((p: any) => p.text)).toEqual(['Nine', 'Ten'])
  })

  it('is 404 to another newsroom and to an id that is no publication, 401 without a session', async () => {
    const { publicationId } = await publishedStory()
    const other = await createTestNewsroom('Compare elsewhere')
    expectStatus(await other.admin.get(`/api/publications/${publicationId}/changes`), 404)
    expectStatus(await newsroom.admin.get(`/api/publications/${datasetId}/changes`), 404)
    expectStatus(await new Client().get(`/api/publications/${publicationId}/changes`), 401)
  })
})
