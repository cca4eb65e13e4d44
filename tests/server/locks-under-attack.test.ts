import { beforeAll, describe, expect, it } from 'vitest'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, proseDoc, readStory, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'
import type { Reply } from '../support/api'

// docs/product-rules.md ("Locks"), after the team's rule: "A locked claim's text and a locked analysis block's settings cannot change. Any save
// that would change them is refused with 423 and a message saying who locked it and when." The
// public page draws only text nodes (PublicationProse.vue), so the passage is what those draw from
// the claim's first to its last marked character.

const PASSAGE = 'Payments cluster below the limit.'

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Lock probe')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

const text = (value: string, claimId?: string) => claimId
  ? { type: 'text', text: value, marks: [{ type: 'claim', attrs: { claimId } }] }
  : { type: 'text', text: value }
const paragraph = (...content: unknown[]) => ({ type: 'paragraph', content })
const doc = (...content: unknown[]) => ({ type: 'doc', content })

/** A story whose prose says "Before. <PASSAGE> After." with PASSAGE marked as its claim, verified. */
async function verifiedPassage(): Promise<{ story: Story, at: string }> {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  const content = doc(paragraph(text('Before. '), text(PASSAGE, story.claimId), text(' After.')))
  expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content }), 200)
  expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [story.analysisBlockId] }), 201)
  const { version } = await blockOf(newsroom.reporter, story, story.proseBlockId)
  const verified = await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { version })
  expectStatus(verified, 200)
  return { story, at: verified.body.decision.at }
}

function expectLocked(reply: Reply, at: string) {
  expectStatus(reply, 423)
  expect(reply.body.data).toMatchObject({ lockedBy: newsroom.names['fact-checker'], lockedAt: at })
}

describe('a verified claim\'s passage, as the page draws it', () => {
  it('refuses words slipped between two marked pieces (the probe\'s "do not")', async () => {
    const { story, at } = await verifiedPassage()
    const slipped = doc(paragraph(text('Before. '), text('Payments ', story.claimId), text('do not '), text('cluster below the limit.', story.claimId), text(' After.')))
    expectLocked(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: slipped }), at)
    const now = await readStory(newsroom.reporter, story)
    expect(now.claims[0]).toMatchObject({ status: 'verified', quote: PASSAGE })
  })

  it('refuses a passage hidden in a node the page does not draw as text', async () => {
    const { story, at } = await verifiedPassage()
    // A paragraph node carrying `text` and the claim mark: never drawn, while the drawn words change.
    const hidden = doc(paragraph(text('Before. Payments do not cluster. After.')), { type: 'paragraph', text: PASSAGE, marks: [{ type: 'claim', attrs: { claimId: story.claimId } }] })
    expectLocked(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: hidden }), at)
  })

  it('refuses a new paragraph break inside the passage and the claim\'s mark put on more text of its block', async () => {
    const { story, at } = await verifiedPassage()
    const split = doc(paragraph(text('Before. '), text('Payments cluster', story.claimId)), paragraph(text(' below the limit.', story.claimId), text(' After.')))
    expectLocked(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: split }), at)
    const widened = doc(paragraph(text('Before. '), text(PASSAGE, story.claimId), text(' After. '), text('And more.', story.claimId)))
    expectLocked(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: widened }), at)
  })

  it('refuses the claim\'s mark on another text block and on a new one', async () => {
    const { story, at } = await verifiedPassage()
    const borrowed = doc(paragraph(text('Elsewhere: '), text('nothing was checked here', story.claimId)))
    expectLocked(await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: borrowed }), at)
    const other = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose' })
    expectStatus(other, 201)
    expectLocked(await saveBlock(newsroom.reporter, story, other.body.id, { content: borrowed }), at)
  })

  it('still takes edits around the passage, and the same passage split into pieces the page draws alike', async () => {
    const { story } = await verifiedPassage()
    const around = doc(paragraph(text('Rewritten intro. '), text('Payments ', story.claimId), text('cluster below the limit.', story.claimId), text(' New ending.')))
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: around }), 200)
  })
})

describe('verifying names what the fact-checker read', () => {
  it('answers 409 with the current passage when the text changed after reading, and 400 when nothing is named', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [] }), 201)
    const read = await blockOf(newsroom['fact-checker'], story, story.proseBlockId)
    const changed = doc(paragraph(text('The ledger lists invented harbour works. '), text('Nine in ten payments start with 1', story.claimId)))
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: changed }), 200)

    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, {}), 400)
    const stale = await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { version: read.version })
    expectStatus(stale, 409)
    expect(stale.body.data.current).toEqual({ quote: 'Nine in ten payments start with 1', version: read.version + 1 })
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: 'Two in five payments' }), 409)
    expect((await readStory(newsroom.reporter, story)).claims[0].status).toBe('open')
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: 'Nine in ten payments start with 1' }), 200)
  })
})

describe('verification racing a change of the claim\'s sources', () => {
  it('never leaves a verified claim citing an unlocked block, nor a block locked that no verified claim cites', async () => {
    for (let round = 0; round < 10; round++) {
      const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
      const second = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', settings: { ...story.settings, test: 'second-digit' } })
      expectStatus(second, 201)
      expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [story.analysisBlockId] }), 201)
      const { version } = await blockOf(newsroom.reporter, story, story.proseBlockId)
      const [sources, verify] = await Promise.all([
        newsroom.reporter.patch(`/api/claims/${story.claimId}`, { supportingBlockIds: [second.body.id] }),
        newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { version }),
      ])
      expectStatus(verify, 200)
      expect([200, 423], JSON.stringify(sources.body)).toContain(sources.status)
      const now = await readStory(newsroom.reporter, story)
      const claim = now.claims[0]
      const locked = now.blocks.filter((b: { lock: unknown }) => b.lock).map((b: { id: string }) => b.id).sort()
      expect(claim.status).toBe('verified')
      expect(locked, `round ${round}: sources ${sources.status}`).toEqual([...claim.supportingBlockIds].sort())
    }
  })
})

describe('two people renaming an investigation at once', () => {
  it('keeps one title and answers the other 409 with the title as it now is', async () => {
    const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'Harbour works' })
    expectStatus(created, 201)
    const { titleVersion } = created.body
    const [a, b] = await Promise.all([
      newsroom.reporter.patch(`/api/investigations/${created.body.id}`, { title: 'Harbour works: the paving', titleVersion }),
      newsroom['data-editor'].patch(`/api/investigations/${created.body.id}`, { title: 'Harbour works: the lighting', titleVersion }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const [won, lost] = a.status === 200 ? [a, b] : [b, a]
    expect(lost.body.data.current).toEqual({ title: won.body.title, titleVersion: titleVersion + 1 })
    const read = await newsroom.reporter.get(`/api/investigations/${created.body.id}`)
    expect(read.body.title).toBe(won.body.title)
  })
})

describe('two admins changing memberships at once', () => {
  it('lets exactly one change land and answers the other 409 (or 403/404 when it came after), never 500; the newsroom keeps an admin', async () => {
    for (let round = 0; round < 6; round++) {
      const desk = await createTestNewsroom(`Two admins ${round}`)
      const members = (await desk.admin.get(`/api/newsrooms/${desk.id}/members`)).body as { membershipId: string, email: string }[]
      const idOf = (email: string) => members.find(m => m.email === email)!.membershipId
      expectStatus(await desk.admin.patch(`/api/memberships/${idOf(desk.emails['data-editor'])}`, { role: 'admin' }), 200)
      const [one, two] = await Promise.all([
        desk.admin.patch(`/api/memberships/${idOf(desk.emails['data-editor'])}`, { role: 'reporter' }),
        round % 2
          ? desk['data-editor'].delete(`/api/memberships/${idOf(desk.emails.admin)}`)
          : desk['data-editor'].patch(`/api/memberships/${idOf(desk.emails.admin)}`, { role: 'reporter' }),
      ])
      // The loser gets 409 when the two overlapped, or the plain answer to who they are now when
      // it came after the winner: 403 for a demoted admin, 404 for a removed one.
      expect(round % 2 && two.status === 200 ? [404, 409] : [200, 403, 409], JSON.stringify(one.body)).toContain(one.status)
      expect([200, 403, 409], JSON.stringify(two.body)).toContain(two.status)
      expect([one.status, two.status].filter(status => status === 200), `round ${round}`).toHaveLength(1)
      const after = (await (one.status === 200 ? desk.admin : desk['data-editor']).get(`/api/newsrooms/${desk.id}/members`)).body as { role: string }[]
      expect(after.filter(m => m.role === 'admin').length, `round ${round}`).toBeGreaterThanOrEqual(1)
    }
  })
})

describe('claim ids chosen by the client', () => {
  it('never says that another newsroom\'s claim id exists', async () => {
    const { story } = await verifiedPassage()
    const outsider = await createTestNewsroom('Outside ids')
    const theirs = await writeStory(outsider.reporter, outsider.id, await uploadPayments(outsider.reporter, outsider.id))
    // The outsider marks a passage with the id of this newsroom's claim.
    expectStatus(await saveBlock(outsider.reporter, theirs, theirs.proseBlockId, { content: proseDoc('Copied ', { text: 'an id', claimId: story.claimId }) }), 200)
    const reply = await outsider.reporter.post(`/api/investigations/${theirs.id}/claims`, { id: story.claimId, blockId: theirs.proseBlockId, supportingBlockIds: [] })
    expectStatus(reply, 400)
    expect(reply.body.data).toEqual([{ path: 'id', message: 'Give the claim a fresh random id.' }])
    // Within one investigation a second POST of the same claim still says what happened.
    const again = await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [] })
    expectStatus(again, 409)
  })
})
