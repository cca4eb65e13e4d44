import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import type { Reply } from '../support/api'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import {
  AFTER_CLAIM, BEFORE_CLAIM, blockOf, CLAIM_TEXT, expectStatus, postClaim, proseDoc, readStory, saveBlock, uploadPayments, writeStory,
} from '../support/stories'
import type { Story } from '../support/stories'

// docs/product-rules.md ("Locks"): a save that would change a verified claim's text, or the settings of an
// analysis block it cites, is refused with 423, and the reply says who locked it and when.

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Locks')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

/** A story whose claim the fact-checker has verified; returns it with the verification's stamp. */
async function verifiedStory(): Promise<{ story: Story, at: string }> {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  const verified = await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT })
  expectStatus(verified, 200)
  expect(verified.body.decision.by).toBe(newsroom.names['fact-checker'])
  return { story, at: verified.body.decision.at }
}

const reporterSaves = (story: Story, content: unknown) => saveBlock(newsroom.reporter, story, story.proseBlockId, { content })
const withClaim = (story: Story, claimText: string, before = BEFORE_CLAIM, after = AFTER_CLAIM) =>
  proseDoc(before, { text: claimText, claimId: story.claimId }, after)

function expectLockedBy(reply: Reply, at: string) {
  expectStatus(reply, 423)
  expect(reply.body.data).toMatchObject({ lockedBy: newsroom.names['fact-checker'], lockedAt: at })
  expect(reply.body.data.message).toContain(newsroom.names['fact-checker'])
}

describe('a verified claim locks its text and the analysis it cites', () => {
  it('refuses a save that edits the claim\'s text with 423, naming who locked it and when', async () => {
    const { story, at } = await verifiedStory()
    const reply = await reporterSaves(story, withClaim(story, CLAIM_TEXT.replace('Two in five', 'Three in five')))
    expectLockedBy(reply, at)
    expect((await blockOf(newsroom.reporter, story, story.proseBlockId)).content).toEqual(withClaim(story, CLAIM_TEXT))
  })

  it('refuses a save that drops the claim mark, even with the words kept', async () => {
    const { story, at } = await verifiedStory()
    expectLockedBy(await reporterSaves(story, proseDoc(BEFORE_CLAIM, CLAIM_TEXT, AFTER_CLAIM)), at)
  })

  it('refuses the data editor too: the lock is on the text, not on a role', async () => {
    const { story, at } = await verifiedStory()
    expectLockedBy(await saveBlock(newsroom['data-editor'], story, story.proseBlockId, { content: withClaim(story, `${CLAIM_TEXT}, roughly`) }), at)
  })

  it('accepts a save that changes only the text around the claim', async () => {
    const { story } = await verifiedStory()
    const edited = withClaim(story, CLAIM_TEXT, 'The invented ledger lists harbour works. ', ', says the desk.')
    const reply = await reporterSaves(story, edited)
    expectStatus(reply, 200)
    expect(reply.body.content).toEqual(edited)
  })

  it('refuses a change to the cited analysis block\'s settings', async () => {
    const { story, at } = await verifiedStory()
    const reply = await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'last-two-digits' } })
    expectLockedBy(reply, at)
    expect((await blockOf(newsroom.reporter, story, story.analysisBlockId)).settings).toEqual(story.settings)
  })

  it('accepts a save of the cited block that keeps its settings as they are', async () => {
    const { story } = await verifiedStory()
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: story.settings }), 200)
  })

  it('refuses to delete the prose block or the cited analysis block', async () => {
    const { story, at } = await verifiedStory()
    expectLockedBy(await newsroom.reporter.delete(`/api/blocks/${story.proseBlockId}`), at)
    expectLockedBy(await newsroom.admin.delete(`/api/blocks/${story.analysisBlockId}`), at)
    expect((await readStory(newsroom.reporter, story)).blocks).toHaveLength(2)
  })

  it('shows the lock on the block and the verification on the claim', async () => {
    const { story, at } = await verifiedStory()
    const doc = await readStory(newsroom.reporter, story)
    expect(doc.blocks.find((b: { id: string }) => b.id === story.analysisBlockId).lock).toEqual({ by: newsroom.names['fact-checker'], at })
    expect(doc.claims).toEqual([expect.objectContaining({ id: story.claimId, status: 'verified', quote: CLAIM_TEXT, decision: { by: newsroom.names['fact-checker'], at } })])
  })

  it('refuses to re-cite or dispute a verified claim until the lock is lifted', async () => {
    const { story } = await verifiedStory()
    expectStatus(await newsroom.reporter.patch(`/api/claims/${story.claimId}`, { supportingBlockIds: [] }), 423)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'Second thoughts.' }), 423)
  })
})

describe('lifting a lock', () => {
  it('lets the same saves through once a data editor lifts the lock with a reason', async () => {
    const { story } = await verifiedStory()
    const edit = withClaim(story, CLAIM_TEXT.replace('Two in five', 'Three in five'))
    expectStatus(await reporterSaves(story, edit), 423)
    const lifted = await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'The count excluded refunds by mistake.' })
    expectStatus(lifted, 200)
    expect(lifted.body).toMatchObject({ status: 'open', note: 'The count excluded refunds by mistake.' })

    expectStatus(await reporterSaves(story, edit), 200)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'last-two-digits' } }), 200)
    expectStatus(await newsroom.reporter.delete(`/api/blocks/${story.analysisBlockId}`), 200)
  })

  it('refuses a lift without a reason, and a lift of a claim that is not locked', async () => {
    const { story } = await verifiedStory()
    const bare = await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: '  ' })
    expectStatus(bare, 400)
    expect(bare.body.data[0].path).toBe('reason')
    expectStatus(await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'Misread the table.' }), 200)
    expectStatus(await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'Again.' }), 409)
  })

  it('keeps an analysis block locked while another verified claim still cites it', async () => {
    const { story } = await verifiedStory()
    const secondId = randomUUID()
    const content = proseDoc(BEFORE_CLAIM, { text: CLAIM_TEXT, claimId: story.claimId }, ' Also: ', { text: 'one payment in five is under 1,300', claimId: secondId }, '.')
    expectStatus(await reporterSaves(story, content), 200)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: secondId, blockId: story.proseBlockId, supportingBlockIds: [story.analysisBlockId] }), 201)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${secondId}/verify`, { quote: 'one payment in five is under 1,300' }), 200)

    expectStatus(await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'Wording to be tightened.' }), 200)
    expect((await blockOf(newsroom.reporter, story, story.analysisBlockId)).lock).toMatchObject({ by: newsroom.names['fact-checker'] })
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 423)

    // The unlocked claim's text may change now; the other verified claim's may not.
    const reworded = proseDoc(BEFORE_CLAIM, { text: 'Two payments in five start with 1', claimId: story.claimId }, ' Also: ', { text: 'one payment in five is under 1,300', claimId: secondId }, '.')
    expectStatus(await reporterSaves(story, reworded), 200)
  })
})
