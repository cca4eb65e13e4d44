import { beforeAll, describe, expect, it } from 'vitest'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// docs/product-rules.md ("Approval follows the method"): an approved analysis block whose settings change goes back to "unreviewed".

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Review reset')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

async function reviewed(decision: 'approved' | 'sent-back'): Promise<Story> {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  const note = decision === 'approved' ? undefined : 'Group by supplier.'
  const reply = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision, note })
  expectStatus(reply, 200)
  expect(reply.body.review).toMatchObject({ status: decision, stamp: { by: newsroom.names['data-editor'] } })
  return story
}

const reviewOf = async (story: Story) => (await blockOf(newsroom.reporter, story, story.analysisBlockId)).review
const resets = async (story: Story) =>
  (await newsroom.reporter.get(`/api/investigations/${story.id}/audit`)).body.events.filter((e: { action: string }) => e.action === 'review.reset')

describe('a review after the method changes', () => {
  it('sends an approved block back to unreviewed when its settings change, and says so in the trail', async () => {
    const story = await reviewed('approved')
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
    expect(await reviewOf(story)).toMatchObject({ status: 'unreviewed', note: null, stamp: null, lapsed: { stamp: { by: newsroom.names['data-editor'] } } })
    expect(await resets(story)).toEqual([expect.objectContaining({
      actor: newsroom.names.reporter, subjectId: story.analysisBlockId, detail: { was: 'approved', reason: 'settings changed' },
    })])
  })

  it('sends a block that was sent back to unreviewed too, once it is changed', async () => {
    const story = await reviewed('sent-back')
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, column: 'supplier', test: 'duplicates' } }), 200)
    expect((await reviewOf(story)).status).toBe('unreviewed')
  })

  it('keeps the approval when the block is saved with the settings it already has', async () => {
    const story = await reviewed('approved')
    // The same settings with their keys in another order: still the same method.
    const { test, column, datasetId: dataset } = story.settings
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { test, column, datasetId: dataset } }), 200)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: story.settings }), 200)
    expect((await reviewOf(story)).status).toBe('approved')
    expect(await resets(story)).toEqual([])
  })

  it('leaves reviews alone when only prose changes', async () => {
    const story = await reviewed('approved')
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: proseDoc('A rewritten paragraph with no claim in it.') }), 200)
    expect(await reviewOf(story)).toMatchObject({ status: 'approved', stamp: { by: newsroom.names['data-editor'] } })
    expect(await resets(story)).toEqual([])
  })

  it('has no method to review on a prose block, and wants a note when sending back', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.proseBlockId}/review`, { decision: 'approved' }), 400)
    const noNote = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back' })
    expectStatus(noNote, 400)
    expect(noNote.body.data[0].path).toBe('note')
    expect((await reviewOf(story)).status).toBe('unreviewed')
  })

  it('refuses to approve settings saved after the data editor read them (409 with the block as it now is)', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const seen = (await blockOf(newsroom['data-editor'], story, story.analysisBlockId)).version
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'last-two-digits' } }), 200)
    const stale = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved', version: seen })
    expectStatus(stale, 409)
    expect(stale.body.data.current).toMatchObject({ id: story.analysisBlockId, version: seen + 1, settings: { test: 'last-two-digits' } })
    expect((await reviewOf(story)).status).toBe('unreviewed')
    // Read again, the same decision goes through.
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved', version: seen + 1 }), 200)
    expect((await reviewOf(story)).status).toBe('approved')
  })
})
