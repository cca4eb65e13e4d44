import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import type { Reply } from '../support/api'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { AFTER_CLAIM, BEFORE_CLAIM, CLAIM_TEXT, blockOf, expectStatus, postClaim, proseDoc, readStory, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// Issue 8: "ten saves of the same block at once → one per version wins, the rest get 409, nothing
// lost". docs/product-rules.md: a save names the version it started from; a stale one gets 409 with the current
// block, in the error shape { statusCode, statusMessage, data }.

const CLIENTS = 10
// Each client of the retrying chain gives up after this many tries; ten writers need at most ten.
const MAX_TRIES = 3 * CLIENTS

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Concurrent saves')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

/** Ten clients signed in as the same reporter, like ten open tabs. */
function tabs(): Client[] {
  return Array.from({ length: CLIENTS }, () => Object.assign(new Client(), { cookie: newsroom.reporter.cookie }))
}

const paragraph = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] })
const filterOf = (i: number) => ({ column: 'supplier', op: 'equals' as const, value: `Supplier ${i}` })

/** One edit per block kind: what client `i` changes, made on top of the block as it now is. */
const EDITS: Record<'prose' | 'analysis', (i: number, current: any) => Record<string, unknown>> = {
  prose: (i: number, current: any) => ({ content: { type: 'doc', content: [...(current.content?.content ?? []), paragraph(`Edit by tab ${i}`)] } }),
  analysis: (i: number, current: any) => ({ settings: { ...current.settings, filters: [...(current.settings?.filters ?? []), filterOf(i)] } }),
}
type Kind = keyof typeof EDITS

async function freshBlock(story: Story, kind: Kind) {
  return blockOf(newsroom.reporter, story, kind === 'prose' ? story.proseBlockId : story.analysisBlockId)
}

describe.each(['prose', 'analysis'] as const)('ten saves of one %s block at once', (kind) => {
  it('one wins; the nine others get 409 with the winner\'s block, and the version rises by one', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const start = await freshBlock(story, kind)
    const changes = Array.from({ length: CLIENTS }, (_, i) => EDITS[kind](i, start))
    const replies = await Promise.all(tabs().map((tab, i) => tab.patch(`/api/blocks/${start.id}`, { version: start.version, ...changes[i] })))

    const statuses = replies.map(r => r.status).sort()
    expect(statuses, JSON.stringify(replies.map(r => r.body))).toEqual([200, ...Array(CLIENTS - 1).fill(409)])
    const winner = replies.findIndex(r => r.status === 200)
    const won = replies[winner]!.body
    expect(won.version).toBe(start.version + 1)
    const stored = await freshBlock(story, kind)
    expect(stored.version).toBe(start.version + 1)
    const field = kind === 'prose' ? 'content' : 'settings'
    expect(stored[field]).toEqual(changes[winner]![field])

    for (const reply of replies.filter(r => r.status === 409)) {
      expect(reply.body).toMatchObject({ statusCode: 409, statusMessage: 'Changed by someone else' })
      expect(reply.body.data.message).toMatch(/saved this block/)
      // The current block, as the winner left it, so that the editor can show both versions.
      expect(reply.body.data.current).toMatchObject({ id: start.id, version: start.version + 1 })
      expect(reply.body.data.current.content).toEqual(stored.content)
      expect(reply.body.data.current.settings).toEqual(stored.settings)
    }
  })

  it('ten saves that retry on 409 with the block from the reply all land, and the version rises by ten', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const start = await freshBlock(story, kind)
    const tries: number[] = []
    /** Tab `i` saves its edit; on 409 it redoes the edit on the block the reply carries. */
    const save = async (tab: Client, i: number) => {
      let current = start
      for (let attempt = 1; attempt <= MAX_TRIES; attempt++) {
        const reply: Reply = await tab.patch(`/api/blocks/${start.id}`, { version: current.version, ...EDITS[kind](i, current) })
        if (reply.status === 200) {
          tries.push(attempt)
          return reply.body
        }
        expectStatus(reply, 409)
        current = reply.body.data.current
      }
      throw new Error(`tab ${i} did not land its save in ${MAX_TRIES} tries`)
    }
    const saved = await Promise.all(tabs().map(save))

    // Every save acknowledged with its own version: one each from start + 1 to start + 10.
    expect(saved.map(b => b.version).sort((a, b) => a - b)).toEqual(Array.from({ length: CLIENTS }, (_, i) => start.version + 1 + i))
    const stored = await freshBlock(story, kind)
    expect(stored.version).toBe(start.version + CLIENTS)
    const mine = Array.from({ length: CLIENTS }, (_, i) => i)
    if (kind === 'prose') {
      const texts = stored.content.content.map((node: any) => node.content?.[0]?.text).filter((t: string) => t?.startsWith('Edit by tab'))
      expect(texts.sort()).toEqual(mine.map(i => `Edit by tab ${i}`).sort())
      // The story's own text is still there, ahead of the edits.
      expect(stored.content.content[0]).toEqual(start.content.content[0])
    }
    else {
      expect(stored.settings.filters.map((f: { value: string }) => f.value).sort()).toEqual(mine.map(i => filterOf(i).value).sort())
      expect(stored.settings).toMatchObject({ datasetId, column: 'amount', test: 'first-digit' })
    }
    // Someone had to wait: ten saves at once cannot all land on the first try.
    expect(Math.max(...tries)).toBeGreaterThan(1)
  })
})

describe('a save racing a fact-checker\'s verification', () => {
  it('either lands first (and the verification of the text read before answers 409) or is refused with 423', async () => {
    const changed = CLAIM_TEXT.replace('Two in five', 'Three in five')
    for (let round = 0; round < 6; round++) {
      const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
      expectStatus(await postClaim(newsroom.reporter, story), 201)
      const { version } = await blockOf(newsroom.reporter, story, story.proseBlockId)
      const [save, verify] = await Promise.all([
        newsroom.reporter.patch(`/api/blocks/${story.proseBlockId}`, { version, content: proseDoc(BEFORE_CLAIM, { text: changed, claimId: story.claimId }, AFTER_CLAIM) }),
        newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { version }),
      ])
      // The fact-checker read `version`: a save that landed first means they read the old text.
      expect([[200, 409], [423, 200]], JSON.stringify([save.body, verify.body])).toContainEqual([save.status, verify.status])
      // docs/product-rules.md: a locked claim's text cannot change, so what the claim quotes is what the text says.
      const now = await readStory(newsroom.reporter, story)
      const claim = now.claims.find((c: { id: string }) => c.id === story.claimId)
      const block = now.blocks.find((b: { id: string }) => b.id === story.proseBlockId)
      if (verify.status === 200) {
        expect(claim).toMatchObject({ status: 'verified', quote: CLAIM_TEXT })
        expect(block.content.content[0].content[1].text).toBe(CLAIM_TEXT)
      }
      else {
        expect(claim.status).toBe('open')
        expect(verify.body.data.current).toEqual({ quote: changed, version: version + 1 })
        expect(block.content.content[0].content[1].text).toBe(changed)
      }
    }
  })
})

describe('saves racing new blocks and removals in the same investigation', () => {
  it('answers every request with 200 or 201, never a deadlock\'s 500, and keeps every change', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const prose = await freshBlock(story, 'prose')
    const analysis = await freshBlock(story, 'analysis')
    const before = (await readStory(newsroom.reporter, story)).blocks.length
    // Insertions lock the investigation and then move later blocks; saves and removals lock a block
    // and touch the investigation. Taken in opposite orders, PostgreSQL ends one with an error.
    const replies: Reply[] = []
    for (let round = 0; round < 5; round++) {
      const [p, a] = await Promise.all([freshBlock(story, 'prose'), freshBlock(story, 'analysis')])
      const spare = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', afterBlockId: prose.id })
      expectStatus(spare, 201)
      replies.push(...await Promise.all([
        newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', afterBlockId: prose.id }),
        newsroom.reporter.patch(`/api/blocks/${prose.id}`, { version: p.version, ...EDITS.prose(round, p) }),
        newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', afterBlockId: null }),
        newsroom.reporter.patch(`/api/blocks/${analysis.id}`, { version: a.version, ...EDITS.analysis(round, a) }),
        newsroom.reporter.delete(`/api/blocks/${spare.body.id}`),
      ]))
    }
    for (const reply of replies) expect([200, 201, 204], JSON.stringify(reply.body).slice(0, 300)).toContain(reply.status)
    const [p, a] = await Promise.all([freshBlock(story, 'prose'), freshBlock(story, 'analysis')])
    expect(p.version).toBe(prose.version + 5)
    expect(a.version).toBe(analysis.version + 5)
    expect(p.content.content.slice(-5)).toEqual([0, 1, 2, 3, 4].map(i => paragraph(`Edit by tab ${i}`)))
    // Ten blocks inserted; the five spares were inserted and removed.
    const now = await readStory(newsroom.reporter, story)
    expect(now.blocks.length).toBe(before + 10)
    expect(new Set(now.blocks.map((b: { id: string }) => b.id)).size).toBe(before + 10)
  })
})
