import { beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../support/api'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// Issue 6: "A review queue shows data editors what waits for them … A fact-check queue shows open and disputed claims."

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Queues')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

async function queueOf(client: Client) {
  const reply = await client.get(`/api/newsrooms/${newsroom.id}/queue`)
  expectStatus(reply, 200)
  return reply.body as { review: { blockId: string, status: string, note: string | null }[], factCheck: { blockId: string, label: string, status: string, note: string | null }[] }
}

const reviewItem = async (client: Client, story: Story) => (await queueOf(client)).review.find(item => item.blockId === story.analysisBlockId)
const claimItems = async (client: Client, story: Story) => (await queueOf(client)).factCheck.filter(item => item.blockId === story.proseBlockId)

describe('the review queue', () => {
  it('shows a block once review is asked for, and drops it when approved', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expect(await reviewItem(newsroom['data-editor'], story)).toBeUndefined()

    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    expect(await reviewItem(newsroom['data-editor'], story)).toMatchObject({ status: 'unreviewed', note: null })
    expect(await reviewItem(newsroom.admin, story)).toBeDefined()
    expect((await queueOf(newsroom.reporter)).review).toEqual([])

    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expect(await reviewItem(newsroom['data-editor'], story)).toBeUndefined()
  })

  it('keeps a sent-back block with its note, and brings an approved block back when it changes', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    const review = (decision: string, note?: string) => newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision, note })

    expectStatus(await review('sent-back', 'Say which year.'), 200)
    expect(await reviewItem(newsroom['data-editor'], story)).toMatchObject({ status: 'sent-back', note: 'Say which year.' })

    expectStatus(await review('approved'), 200)
    expectStatus(await newsroom.reporter.patch(`/api/blocks/${story.analysisBlockId}`, { version: 1, settings: { ...story.settings, test: 'first-two-digits' } }), 200)
    expect(await reviewItem(newsroom['data-editor'], story)).toMatchObject({ status: 'unreviewed' })
  })
})

describe('the fact-check queue', () => {
  it('shows an open claim, keeps it while disputed, drops it when verified and shows it again when the lock is lifted', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    expect(await claimItems(newsroom['fact-checker'], story)).toEqual([expect.objectContaining({ label: CLAIM_TEXT, status: 'open' })])
    expect((await queueOf(newsroom.reporter)).factCheck).toEqual([])

    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'Which five payments?' }), 200)
    expect(await claimItems(newsroom['fact-checker'], story)).toEqual([expect.objectContaining({ status: 'disputed', note: 'Which five payments?' })])

    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`), 200)
    expect(await claimItems(newsroom['fact-checker'], story)).toEqual([])

    expectStatus(await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'Recount needed.' }), 200)
    expect(await claimItems(newsroom['fact-checker'], story)).toEqual([expect.objectContaining({ status: 'open' })])
  })

  it('lists nothing from another newsroom', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    const other = await createTestNewsroom('Other queues')
    const theirs = await other['fact-checker'].get(`/api/newsrooms/${other.id}/queue`)
    expectStatus(theirs, 200)
    expect(theirs.body).toEqual({ review: [], factCheck: [] })
    expectStatus(await other['fact-checker'].get(`/api/newsrooms/${newsroom.id}/queue`), 404)
  })
})
